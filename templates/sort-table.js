// Click-to-sort for the appendix tables marked "sortable". Progressive enhancement: the headings
// become buttons only when this runs; without it the tables keep the order they were printed in.
(function () {
  'use strict';
  function key(cell) {
    var k = cell.getAttribute('data-sort');
    if (k === null) k = cell.textContent || '';
    var n = Number(k);
    return k !== '' && !isNaN(n) ? n : k.toLowerCase();
  }
  function compare(x, y) {
    if (typeof x === typeof y) return x < y ? -1 : x > y ? 1 : 0;
    return typeof x === 'number' ? -1 : 1;
  }
  var tables = document.querySelectorAll('table.sortable');
  Array.prototype.forEach.call(tables, function (table) {
    var heads = table.tHead.rows[0].cells;
    Array.prototype.forEach.call(heads, function (th, index) {
      var button = document.createElement('button');
      button.type = 'button';
      button.className = 'sort';
      while (th.firstChild) button.appendChild(th.firstChild);
      th.appendChild(button);
      button.addEventListener('click', function () {
        var direction = th.getAttribute('aria-sort') === 'ascending' ? 'descending' : 'ascending';
        Array.prototype.forEach.call(heads, function (h) { h.removeAttribute('aria-sort'); });
        th.setAttribute('aria-sort', direction);
        var body = table.tBodies[0];
        var rows = Array.prototype.slice.call(body.rows);
        rows.sort(function (a, b) {
          var c = compare(key(a.cells[index]), key(b.cells[index]));
          return direction === 'ascending' ? c : -c;
        });
        rows.forEach(function (r) { body.appendChild(r); });
      });
    });
  });
})();

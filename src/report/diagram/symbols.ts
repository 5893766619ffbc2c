/**
 * The standard fault-tree symbols as SVG path data (the conventional shapes of NUREG-0492, the
 * Fault Tree Handbook, US NRC 1981; the proportions here are ours). Each function takes the
 * horizontal centre and the top of the symbol's box, so the output is at the top and the inputs
 * leave from the bottom.
 */

const r = (x: number) => Math.round(x * 100) / 100;

/** OR gate: a shield with a concave base, curving to a point at the output. */
export function orPath(cx: number, top: number, w: number, h: number): string {
  const l = cx - w / 2;
  const rt = cx + w / 2;
  const b = top + h;
  return [
    `M${r(l)},${r(b)}`,
    `Q${r(cx)},${r(b - h * 0.3)} ${r(rt)},${r(b)}`,
    `Q${r(rt)},${r(top + h * 0.38)} ${r(cx)},${r(top)}`,
    `Q${r(l)},${r(top + h * 0.38)} ${r(l)},${r(b)}`,
    'Z',
  ].join(' ');
}

/** AND gate: a dome on a flat base. */
export function andPath(cx: number, top: number, w: number, h: number): string {
  const l = cx - w / 2;
  const rt = cx + w / 2;
  const b = top + h;
  const radius = w / 2;
  const shoulder = top + Math.min(radius, h);
  return `M${r(l)},${r(b)} L${r(l)},${r(shoulder)} A${r(radius)},${r(Math.min(radius, h))} 0 0 1 ${r(rt)},${r(shoulder)} L${r(rt)},${r(b)} Z`;
}

/** NOT gate: a short shield (as OR) whose output carries the inversion bubble; see `notBubble`. */
export function notPath(cx: number, top: number, w: number, h: number, bubble: number): string {
  return orPath(cx, top + 2 * bubble, w * 0.8, h - 2 * bubble);
}

/** Centre of the inversion bubble of the NOT gate. */
export function notBubble(cx: number, top: number, bubble: number): { cx: number; cy: number; r: number } {
  return { cx: r(cx), cy: r(top + bubble), r: r(bubble) };
}

/** House event: a pentagon (walls and a pitched roof). */
export function housePath(cx: number, top: number, w: number, h: number): string {
  const l = cx - w / 2;
  const rt = cx + w / 2;
  const eave = top + h * 0.42;
  const b = top + h;
  return `M${r(cx)},${r(top)} L${r(rt)},${r(eave)} L${r(rt)},${r(b)} L${r(l)},${r(b)} L${r(l)},${r(eave)} Z`;
}

/** Transfer: an equilateral-looking triangle, apex up. */
export function trianglePath(cx: number, top: number, w: number, h: number): string {
  return `M${r(cx)},${r(top)} L${r(cx + w / 2)},${r(top + h)} L${r(cx - w / 2)},${r(top + h)} Z`;
}

/** Undeveloped / unresolved reference: a diamond. */
export function diamondPath(cx: number, top: number, w: number, h: number): string {
  return `M${r(cx)},${r(top)} L${r(cx + w / 2)},${r(top + h / 2)} L${r(cx)},${r(top + h)} L${r(cx - w / 2)},${r(top + h / 2)} Z`;
}

export { r as round };

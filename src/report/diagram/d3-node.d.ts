/**
 * The small part of d3-node (4.x, an ES module without type declarations) that the diagrams use.
 * A d3 selection is chainable; only the methods called here are declared.
 */
declare module 'd3-node' {
  export interface D3Selection {
    append(name: string): D3Selection;
    attr(name: string, value: string | number): D3Selection;
    text(value: string): D3Selection;
    remove(): D3Selection;
    node(): { outerHTML: string } | null;
  }
  export class D3Node {
    constructor(options?: { styles?: string });
    createSVG(width?: number, height?: number, attrs?: Record<string, string | number>): D3Selection;
    svgString(): string;
  }
}

/**
 * A plot as a file a report can use: its SVG with every style written inline (no page CSS, no CSS
 * variables, so the file opens alone), and a PNG drawn from that SVG on a canvas at twice its size.
 * Both go through blob: URLs, which the app's CSP allows for images and downloads (proxy.ts).
 */
import { downloadBlob } from "./downloads";

const SVG_NS = "http://www.w3.org/2000/svg";

/** The properties that decide how an SVG element looks, copied from its computed style. */
const STYLE_PROPERTIES = [
  "fill",
  "fill-opacity",
  "fill-rule",
  "stroke",
  "stroke-width",
  "stroke-opacity",
  "stroke-dasharray",
  "stroke-linecap",
  "stroke-linejoin",
  "opacity",
  "font-family",
  "font-size",
  "font-weight",
  "font-style",
  "text-anchor",
  "dominant-baseline",
  "letter-spacing",
  "paint-order",
  "visibility",
] as const;

/** The computed value of a CSS custom property's colour (light-dark() resolved), e.g. the paper behind the plot. */
function resolvedColour(el: Element, cssValue: string): string {
  const probe = document.createElementNS(SVG_NS, "rect");
  probe.style.fill = cssValue;
  el.appendChild(probe);
  const value = getComputedStyle(probe).fill;
  probe.remove();
  return value;
}

/**
 * The plot's SVG as a standalone document: each element's look copied from its computed style into a
 * style attribute, classes and CSS variables gone, elements marked `data-export="skip"` (hover rings,
 * focus outlines) left out, a paper-coloured background behind it and an explicit size in pixels.
 */
export function serialiseSvg(svg: SVGSVGElement, options: { title?: string } = {}): { text: string; width: number; height: number } {
  const box = svg.getBoundingClientRect();
  const width = Math.max(1, Math.round(box.width));
  const height = Math.max(1, Math.round(box.height));
  const clone = svg.cloneNode(true) as SVGSVGElement;
  const originals = [svg, ...Array.from(svg.querySelectorAll("*"))];
  const copies = [clone, ...Array.from(clone.querySelectorAll("*"))];
  const computedOf = new Map<Element, CSSStyleDeclaration>();
  originals.forEach((el, k) => {
    const copy = copies[k];
    const computed = getComputedStyle(el);
    computedOf.set(el, computed);
    const parent = el === svg ? undefined : el.parentElement ? computedOf.get(el.parentElement) : undefined;
    // these properties inherit in SVG: an element writes only what differs from its parent (opacity does
    // not inherit, so it is written wherever it is not 1), which keeps the file small and readable
    const style = STYLE_PROPERTIES.map((p) => [p, computed.getPropertyValue(p)] as const)
      .filter(([p, v]) => v !== "" && (p === "opacity" ? v !== "1" : !parent || parent.getPropertyValue(p) !== v))
      .map(([p, v]) => `${p}:${v}`)
      .join(";");
    if (style) copy.setAttribute("style", style);
    else copy.removeAttribute("style");
    copy.removeAttribute("class");
    // presentation attributes may hold var(…), which a standalone file cannot resolve: the style holds the values
    for (const attr of Array.from(copy.attributes)) if (attr.value.includes("var(")) copy.removeAttribute(attr.name);
  });
  for (const skip of Array.from(clone.querySelectorAll('[data-export="skip"]'))) skip.remove();
  for (const name of ["tabindex", "role", "aria-label", "aria-describedby", "focusable"]) clone.removeAttribute(name);
  clone.setAttribute("xmlns", SVG_NS);
  clone.setAttribute("width", String(width));
  clone.setAttribute("height", String(height));
  if (!clone.getAttribute("viewBox")) clone.setAttribute("viewBox", `0 0 ${width} ${height}`);
  const [vx, vy, vw, vh] = (clone.getAttribute("viewBox") ?? "").split(/[\s,]+/).map(Number);
  const paper = document.createElementNS(SVG_NS, "rect");
  paper.setAttribute("x", String(vx));
  paper.setAttribute("y", String(vy));
  paper.setAttribute("width", String(vw));
  paper.setAttribute("height", String(vh));
  paper.setAttribute("style", `fill:${resolvedColour(svg, "var(--pt-surface, #faf7ee)")}`);
  clone.insertBefore(paper, clone.firstChild);
  if (options.title) {
    const title = document.createElementNS(SVG_NS, "title");
    title.textContent = options.title;
    clone.insertBefore(title, clone.firstChild);
  }
  const text = `<?xml version="1.0" encoding="UTF-8"?>\n${new XMLSerializer().serializeToString(clone)}\n`;
  return { text, width, height };
}

/** Draws standalone SVG text on a canvas at `scale`× its size and returns the PNG. */
export async function svgToPng(svgText: string, width: number, height: number, scale = 2): Promise<Blob> {
  const url = URL.createObjectURL(new Blob([svgText], { type: "image/svg+xml" }));
  try {
    const image = new Image();
    image.decoding = "async";
    image.src = url;
    await image.decode();
    const canvas = document.createElement("canvas");
    canvas.width = Math.round(width * scale);
    canvas.height = Math.round(height * scale);
    const ctx = canvas.getContext("2d");
    if (!ctx) throw new Error("This browser cannot draw on a canvas.");
    ctx.drawImage(image, 0, 0, canvas.width, canvas.height);
    return await new Promise<Blob>((resolve, reject) => canvas.toBlob((b) => (b ? resolve(b) : reject(new Error("The image could not be encoded as PNG."))), "image/png"));
  } finally {
    URL.revokeObjectURL(url);
  }
}

export type PlotExportKind = "png" | "svg" | "csv";

/** Downloads a plot as `<stem>.png`, `.svg` or its data as `.csv`. */
export async function exportPlot(kind: PlotExportKind, stem: string, svg: SVGSVGElement | null, csv: () => string, title?: string): Promise<void> {
  if (kind === "csv") {
    downloadBlob(`${stem}.csv`, new Blob([csv()], { type: "text/csv" }));
    return;
  }
  if (!svg) throw new Error("The plot is not drawn yet.");
  const { text, width, height } = serialiseSvg(svg, { title });
  if (kind === "svg") {
    downloadBlob(`${stem}.svg`, new Blob([text], { type: "image/svg+xml" }));
    return;
  }
  downloadBlob(`${stem}.png`, await svgToPng(text, width, height, 2));
}

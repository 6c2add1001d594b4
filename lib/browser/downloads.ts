/**
 * Browser downloads of the results panel (the composite's Touchstone text comes from the engine's
 * writeCompositeTouchstone, the CSV from results-math, plot images from plot-export).
 */

/** Offers `blob` as a file download (temporary blob: URL and link). Browser only. */
export function downloadBlob(name: string, blob: Blob): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

/** Offers `text` as a file download. Browser only. */
export function downloadText(name: string, text: string, type: string): void {
  downloadBlob(name, new Blob([text], { type }));
}

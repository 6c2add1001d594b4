/**
 * Browser downloads of the results panel (the composite's Touchstone text comes from the engine's
 * writeCompositeTouchstone, the CSV from results-math).
 */

/** Offers `text` as a file download (Blob + temporary link). Browser only. */
export function downloadText(name: string, text: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

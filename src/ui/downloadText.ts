/**
 * Offer text as a file download (a temporary blob: URL; nothing leaves the browser).
 * @param text the file's contents
 * @param name the suggested file name
 * @param type the MIME type (default JSON)
 */
export function downloadText(text: string, name: string, type = 'application/json'): void {
  const blob = new Blob([text], { type });
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

/** Hands text to the browser as a file download. */
export function downloadFile(fileName: string, text: string, mimeType: string): void {
  // The byte-order mark lets spreadsheet programs read UTF-8 names correctly.
  const blob = new Blob(["\ufeff", text], { type: mimeType });
  const url = URL.createObjectURL(blob);
  const link = document.createElement("a");
  link.href = url;
  link.download = fileName;
  link.rel = "noopener";
  document.body.append(link);
  link.click();
  link.remove();
  URL.revokeObjectURL(url);
}

// CSV text as RFC 4180 describes it: fields separated by commas, records by CRLF, a field holding a comma,
// double quote, CR or LF enclosed in double quotes with inner quotes doubled.

export type CsvValue = string | number | boolean | null | undefined;

/**
 * Text fields starting with = + − @ tab or CR are prefixed with an apostrophe, so a spreadsheet opening the
 * file does not run them as formulas (the OWASP "CSV injection" advice — common practice, not part of RFC 4180).
 * Numbers are written as they are.
 */
export function csvField(value: CsvValue): string {
  if (value === null || value === undefined) return "";
  let text = String(value);
  if (typeof value === "string" && /^[=+\-@\t\r]/.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function toCsv(header: readonly string[], rows: readonly (readonly CsvValue[])[]): string {
  return [header, ...rows].map((row) => row.map(csvField).join(",")).join("\r\n") + "\r\n";
}

/** Offers `text` as a file download (browser only). */
export function downloadText(filename: string, text: string, type = "text/csv;charset=utf-8"): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const link = document.createElement("a");
  link.href = url;
  link.download = filename;
  document.body.appendChild(link);
  link.click();
  link.remove();
  // revoke after the click has been handled, or some browsers cancel the download
  setTimeout(() => URL.revokeObjectURL(url), 0);
}

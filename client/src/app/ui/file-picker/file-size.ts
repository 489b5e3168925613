/** `482304` → `471 kB`; bytes below 1 kB, MB from 1 MB (binary multiples, as file managers show). */
export function formatFileSize(bytes: number, locale: string): string {
  const number = (value: number, digits: number) => new Intl.NumberFormat(locale, { maximumFractionDigits: digits }).format(value);
  if (bytes < 1024) return `${number(bytes, 0)} bytes`;
  if (bytes < 1024 * 1024) return `${number(bytes / 1024, bytes < 10 * 1024 ? 1 : 0)} kB`;
  return `${number(bytes / 1024 / 1024, 1)} MB`;
}

/**
 * Why a chosen file is too large to send, in plain words ("big.pdf is 12 MB, more than the
 * 10 MB allowed. Choose a smaller file."), or null when it fits. The server checks again.
 */
export function fileSizeProblem(file: File, maxBytes: number, locale: string): string | null {
  if (file.size <= maxBytes) return null;
  const size = formatFileSize(file.size, locale);
  const max = formatFileSize(maxBytes, locale);
  // Just over the limit both round alike ("10 MB, more than the 10 MB"): then the size says nothing.
  const what = size === max ? 'larger than' : `${size}, more than`;
  return `${file.name} is ${what} the ${max} allowed. Choose a smaller file.`;
}

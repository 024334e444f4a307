/**
 * Number formatting for readouts and chart labels. The formatters are built once: creating an
 * Intl.NumberFormat (which toLocaleString with options does on every call) is far slower than
 * the drawing it labels.
 */
const formatters = new Map<number, Intl.NumberFormat>();

export function formatNumber(n: number, digits = 0): string {
  let f = formatters.get(digits);
  if (!f) {
    f = new Intl.NumberFormat("en-GB", { maximumFractionDigits: digits, minimumFractionDigits: digits });
    formatters.set(digits, f);
  }
  return f.format(n);
}

/**
 * The caution's words: shown by the caution component on every screen with calculations, and
 * printed on exported charts and on every page of the training record PDF.
 */
export const CAUTION_TEXT =
  "For ground teaching only: not for flight planning or operation. The aircraft's flight manual, local regulations and licensed instructors prevail.";

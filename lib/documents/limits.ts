/** How many calculation sheets one request renders while the browser waits (pure: the line table imports it). */
export const SHEETS_INLINE_LIMIT = 50;

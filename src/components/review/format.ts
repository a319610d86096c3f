/** Number and time formats shared by the review and report screens. */
export const fixed = (value: number | null | undefined, places = 2) => (value === null || value === undefined ? '—' : Number(value.toFixed(places)).toString());
export const percent = (value: number | null | undefined) => (value === null || value === undefined ? '—' : `${Math.round(value * 100)}%`);
export const clock = (iso: string) => new Date(iso).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' });
export const dateTime = (iso: string | Date) => new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' });

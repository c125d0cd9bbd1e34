/**
 * A session's start and end in local time for the screens: the end shows only its time when it falls on the start's
 * local day, and its date too when it does not (a session over midnight, or one ended days later), so "to 12:28"
 * never reads as the same day when it was not.
 */
export function localSpanText(startIso: string, endIso: string | null): string {
  const start = new Date(startIso);
  if (endIso === null) return start.toLocaleString();
  const end = new Date(endIso);
  return `${start.toLocaleString()} to ${sameLocalDay(start, end) ? end.toLocaleTimeString() : end.toLocaleString()}`;
}

function sameLocalDay(a: Date, b: Date): boolean {
  return a.getFullYear() === b.getFullYear() && a.getMonth() === b.getMonth() && a.getDate() === b.getDate();
}

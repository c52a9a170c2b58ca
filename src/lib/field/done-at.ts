/**
 * How far the time a phone says the work was done may lie from the server's clock: a little ahead (phone clocks
 * drift), and back as far as a phone may reasonably stay off the network with work on it.
 */
export const DONE_AT_AHEAD_MS = 5 * 60 * 1000;
export const DONE_AT_BACK_DAYS = 90;
const DAY_MS = 24 * 60 * 60 * 1000;

/** Why `doneAt` cannot be taken at server time `now`, or null when it can. */
export function doneAtProblem(doneAt: Date, now: Date): string | null {
  const ahead = doneAt.getTime() - now.getTime();
  if (ahead > DONE_AT_AHEAD_MS) {
    return `The time the work was done is ${Math.round(ahead / 60000)} minutes ahead of the server's clock (at most 5 are accepted): check the phone's date and time.`;
  }
  if (-ahead > DONE_AT_BACK_DAYS * DAY_MS) {
    return `The time the work was done is more than ${DONE_AT_BACK_DAYS} days ago: log it as a new entry and say when in the note.`;
  }
  return null;
}

// Everything a grower reads about recording without a signal, in one place (the Spanish catalogue takes its
// messages from here). Plain strings and small functions only.

export const OFFLINE_WORDS = {
  appName: "Seedplot",
  appDescription: "Record on-farm trial observations plot by plot, with or without a signal.",
  allSaved: "Values save as you go.",
  noSignal: "No signal. Values you type are kept on this phone and sent when the signal is back.",
  retryNow: "Send now",
  stateSaving: "Sending…",
  stateSaved: "Saved",
  stateWaiting: "Waiting on this phone",
  savedOnSeedplot: (shown: string) => `Saved on Seedplot: ${shown}`,
  nothingSavedYet: "Nothing saved on Seedplot yet",
  signedOut: "You have been signed out. Your values are kept on this phone; sign in again in another tab, then press Send now.",
  conflictTitle: "Someone else changed this value",
  conflictBoth: (theirs: string, yours: string) => `Seedplot now has ${theirs}. You typed ${yours}. Which is right?`,
  keepTheirs: (theirs: string) => `Keep ${theirs}`,
  useMine: (yours: string) => `Use mine (${yours})`,
  emptyValue: "no value",
  conflictsWaiting: (n: number) => (n === 1 ? "1 value needs your choice below." : `${n} values need your choice below.`),
  signOutTitle: "Values not sent yet",
  signOutWarning: (n: number) =>
    `${n === 1 ? "1 value typed on this phone has" : `${n} values typed on this phone have`} not reached Seedplot yet. Signing out deletes ${n === 1 ? "it" : "them"} from this phone.`,
  signOutAnyway: (n: number) => (n === 1 ? "Sign out and delete it" : "Sign out and delete them"),
  stayHere: "Stay signed in",
} as const;

/** The waiting line over the form: how many values are on the phone only. */
export function waitingOnPhone(n: number): string {
  return `${n === 1 ? "1 value is" : `${n} values are`} waiting on this phone. ${n === 1 ? "It is" : "They are"} sent by themselves when there is a signal.`;
}

/** The one line over the form without a signal, with what waits on the phone. */
export function noSignalWaiting(n: number): string {
  return `No signal. ${n === 1 ? "1 value is" : `${n} values are`} waiting on this phone and ${n === 1 ? "goes" : "go"} by ${n === 1 ? "itself" : "themselves"} when the signal is back.`;
}

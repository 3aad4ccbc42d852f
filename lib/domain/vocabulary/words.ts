// Counting words shared by every message, so "1 plot" / "2 plots" reads the same everywhere.

/** "1 plot", "3 plots"; give the plural when it is not the noun plus "s". */
export function plural(n: number, noun: string, nouns = `${noun}s`): string {
  return `${n} ${n === 1 ? noun : nouns}`;
}

/** A sentence or heading that starts with a capital: "earliest here" -> "Earliest here". */
export function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

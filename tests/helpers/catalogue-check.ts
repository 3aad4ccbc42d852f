import { parse, TYPE, type MessageFormatElement } from "@formatjs/icu-messageformat-parser";

type Tree = { [key: string]: string | Tree };

/** Every message of a catalogue by its dotted key ("upload.row"). */
export function flatten(tree: Tree, prefix = ""): Map<string, string> {
  const out = new Map<string, string>();
  for (const [k, v] of Object.entries(tree)) {
    const key = prefix ? `${prefix}.${k}` : k;
    if (typeof v === "string") out.set(key, v);
    else for (const [kk, vv] of flatten(v, key)) out.set(kk, vv);
  }
  return out;
}

/** The ICU arguments a message uses ({name}, {count, plural, …}, and those inside its branches). */
export function placeholders(message: string): Set<string> {
  const found = new Set<string>();
  const walk = (els: MessageFormatElement[]) => {
    for (const el of els) {
      if (el.type === TYPE.literal || el.type === TYPE.pound) continue;
      found.add(el.value);
      if (el.type === TYPE.plural || el.type === TYPE.select) for (const option of Object.values(el.options)) walk(option.value);
      if (el.type === TYPE.tag) walk(el.children);
    }
  };
  walk(parse(message));
  return found;
}

/**
 * What is wrong with a translation against the English source: a key without a translation (or an empty
 * one), a translation missing a placeholder of the original, a message that is not valid ICU, or a key the
 * source does not have.
 */
export function catalogueProblems(source: Tree, translation: Tree): string[] {
  const en = flatten(source);
  const other = flatten(translation);
  const problems: string[] = [];
  for (const [key, message] of en) {
    const translated = other.get(key);
    if (translated === undefined || translated.trim() === "") {
      problems.push(`${key}: no translation`);
      continue;
    }
    let theirs: Set<string>;
    try {
      theirs = placeholders(translated);
    } catch (e) {
      problems.push(`${key}: not a valid ICU message (${(e as Error).message})`);
      continue;
    }
    for (const name of placeholders(message)) if (!theirs.has(name)) problems.push(`${key}: the translation lacks the placeholder {${name}}`);
  }
  for (const key of other.keys()) if (!en.has(key)) problems.push(`${key}: not in the English catalogue`);
  return problems;
}

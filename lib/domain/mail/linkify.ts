/** A piece of a message's text: plain, or a link to this app. */
export type TextSegment = { text: string; href?: string };

// Sentence punctuation right after a link belongs to the sentence; Seedplot's own links never end in it.
const TRAILING_PUNCTUATION = /[.,;:!?)\]'"]+$/;

/**
 * Splits text into plain parts and links, linking only http(s) addresses whose parsed origin is the
 * app's own. Comparing the parsed origin (not the text's start) keeps `http://app@evil.example/`,
 * `http://app.evil.example`, another port or scheme, and backslash tricks as plain text. The link
 * points at the address as a browser reads it (`URL.href`), the text shows what the message said.
 */
export function linkSegments(text: string, appUrl: string): TextSegment[] {
  const appOrigin = new URL(appUrl).origin;
  const segments: TextSegment[] = [];
  const pushText = (t: string) => {
    if (!t) return;
    const last = segments[segments.length - 1];
    if (last && last.href === undefined) last.text += t;
    else segments.push({ text: t });
  };
  for (const part of text.split(/(https?:\/\/\S+)/gi)) {
    const trailing = TRAILING_PUNCTUATION.exec(part)?.[0] ?? "";
    const candidate = part.slice(0, part.length - trailing.length);
    const url = /^https?:\/\//i.test(candidate) ? parseUrl(candidate) : null;
    if (url && url.origin === appOrigin && url.username === "" && url.password === "") {
      segments.push({ text: candidate, href: url.href });
      pushText(trailing);
    } else {
      pushText(part);
    }
  }
  return segments;
}

function parseUrl(text: string): URL | null {
  try {
    return new URL(text);
  } catch {
    return null;
  }
}

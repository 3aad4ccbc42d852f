import "server-only";
import { randomBytes } from "node:crypto";
import { NextResponse, type NextRequest } from "next/server";
import { readPublicGeneration } from "@/db/queries/public";
import { listeningPort } from "@/lib/env";
import { publicCacheKey } from "@/lib/domain/publish/public-cache-key";
import { BoundedStore } from "@/lib/domain/cache/bounded-store";
import { contentSecurityPolicy, newNonce } from "@/server/http/content-security-policy";

// The public cache: anonymous public pages and open data answers, rendered once per state of what is
// published and then sent from memory. proxy.ts asks it first for every request.
//
// - Correct with several app instances: every cached answer is tagged with the public generation stamp
//   it was rendered under (db/queries/public.ts, readPublicGeneration), and every request reads the stamp
//   again (one primary-key read), so a publication or withdrawal committed through any instance is seen
//   by every instance at its next request. Writers renew the stamp with renewPublicGeneration(tx)
//   (db/mutations/publish.ts) in the transaction that changes what the public sees.
// - Anonymous only: a request carrying a session cookie, and Next's router requests (RSC payloads), are
//   never answered from here and never stored; the cache fills itself by rendering the address once
//   more with no cookie at all.
// - The content security policy stays per response: the render's nonce is cut out of the stored copy and
//   each answer gets a fresh nonce and its own policy, exactly as a rendered page would.
// - Bounded: only addresses lib/domain/publish/public-cache-key.ts names, only 200 answers (unknown codes
//   are never stored), least recently used dropped beyond MAX_ENTRIES or MAX_BYTES.

const MAX_ENTRIES = 2_000;
const MAX_BYTES = 96 * 1024 * 1024;
const RENDER_TIMEOUT_MS = 60_000;

/** Marks the cache's own render request; a per-process secret, so nobody else can skip the cache. */
const RENDER_HEADER = "x-seedplot-public-render";
const RENDER_TOKEN = randomBytes(24).toString("base64url");

/** Says how an answer was made (hit, miss); a request the cache does not serve has none. */
export const PUBLIC_CACHE_HEADER = "x-public-cache";

// Headers of a render that are not kept: the policy is made per answer, the rest describe one transfer.
const NOT_KEPT = new Set(["content-security-policy", "content-length", "content-encoding", "transfer-encoding", "connection", "keep-alive", "date", PUBLIC_CACHE_HEADER]);
// Next's client router asks for RSC payloads with these; they are rendered per request as before.
const ROUTER_HEADERS = ["rsc", "next-router-prefetch", "next-router-state-tree", "next-router-segment-prefetch", "next-action", "next-url"];

interface Answer {
  status: number;
  headers: [string, string][];
  /** the body cut at each occurrence of the render's nonce */
  parts: Buffer[];
  /** the render's own nonce (used once, inside this server), replaced in header values such as Link */
  renderNonce: string | null;
  bytes: number;
}

interface Kept extends Answer {
  generation: string;
}

const kept = new BoundedStore<Kept>(MAX_ENTRIES, MAX_BYTES);
const rendering = new Map<string, Promise<Answer | null>>();
let lastGeneration: string | null = null;

const signedIn = (request: NextRequest) => request.cookies.getAll().some(({ name }) => name.includes("next-auth.session-token"));

/**
 * The answer to a public request from the cache (rendering and keeping it first when needed), or null
 * when the request is not one the cache serves: the caller then renders it as usual.
 */
export async function answerFromPublicCache(request: NextRequest): Promise<NextResponse | null> {
  if (request.method !== "GET" && request.method !== "HEAD") return null;
  if (request.headers.get(RENDER_HEADER) === RENDER_TOKEN) return null;
  const key = publicCacheKey(request.nextUrl.pathname, request.nextUrl.search);
  if (key === null || signedIn(request) || ROUTER_HEADERS.some((h) => request.headers.has(h))) return null;
  const port = listeningPort();
  if (port === null) return null;
  let generation: string;
  try {
    generation = await generationNow();
  } catch {
    // the database is unreachable: the page renders and answers as it does without a cache
    return null;
  }
  if (generation !== lastGeneration) {
    kept.clear();
    lastGeneration = generation;
  }
  const found = kept.get(key);
  if (found && found.generation === generation) return answer(request, found, "hit");
  const rendered = await renderOnce(port, key, generation);
  return rendered && answer(request, rendered, "miss");
}

let reading: Promise<string> | null = null;
let nextReading: Promise<string> | null = null;

/**
 * The public generation as the database holds it after this call began. Requests arriving while a read
 * is on its way share the next read, which starts once that one is back, so the stamp costs at most one
 * query in flight per instance however many requests come in, and no request is answered with a read
 * that began before it arrived.
 */
function generationNow(): Promise<string> {
  if (reading === null) return startReading();
  nextReading ??= reading.then(ignore, ignore).then(() => {
    nextReading = null;
    return reading ?? startReading();
  });
  return nextReading;
}

function startReading(): Promise<string> {
  const read = readPublicGeneration();
  reading = read;
  read.then(ignore, ignore).then(() => {
    if (reading === read) reading = null;
  });
  return read;
}

const ignore = () => undefined;

/** One render per address and generation at a time; concurrent requests for it share the result. */
function renderOnce(port: number, key: string, generation: string): Promise<Answer | null> {
  const id = `${generation} ${key}`;
  const pending = rendering.get(id);
  if (pending) return pending;
  const started = render(port, key)
    .then((rendered) => {
      if (rendered?.status === 200) kept.set(key, { ...rendered, generation });
      return rendered;
    })
    .catch(() => null)
    .finally(() => rendering.delete(id));
  rendering.set(id, started);
  return started;
}

/** Renders an address through this server with no cookie, as an anonymous visitor would get it. */
async function render(port: number, key: string): Promise<Answer | null> {
  const response = await fetch(`http://127.0.0.1:${port}${key}`, {
    headers: { [RENDER_HEADER]: RENDER_TOKEN, "accept-encoding": "identity" },
    redirect: "manual",
    cache: "no-store",
    signal: AbortSignal.timeout(RENDER_TIMEOUT_MS),
  });
  const body = Buffer.from(await response.arrayBuffer());
  // an answer that sets a cookie is no one's to share; the request is rendered as usual instead
  if (response.headers.has("set-cookie")) return null;
  const nonce = /'nonce-([^']+)'/.exec(response.headers.get("content-security-policy") ?? "")?.[1];
  const parts = nonce ? cutAt(body, Buffer.from(nonce)) : [body];
  const headers = [...response.headers].filter(([name]) => !NOT_KEPT.has(name.toLowerCase()));
  return { status: response.status, headers, parts, renderNonce: nonce ?? null, bytes: body.length + headers.reduce((n, [k, v]) => n + k.length + v.length, 0) };
}

function cutAt(body: Buffer, separator: Buffer): Buffer[] {
  const parts: Buffer[] = [];
  let from = 0;
  for (let at = body.indexOf(separator); at !== -1; at = body.indexOf(separator, from)) {
    parts.push(body.subarray(from, at));
    from = at + separator.length;
  }
  parts.push(body.subarray(from));
  return parts;
}

function answer(request: NextRequest, a: Answer, how: "hit" | "miss"): NextResponse {
  const nonce = newNonce();
  const headers = new Headers(a.renderNonce === null ? a.headers : a.headers.map(([k, v]): [string, string] => [k, v.replaceAll(a.renderNonce!, nonce)]));
  headers.set("content-security-policy", contentSecurityPolicy(nonce));
  headers.set(PUBLIC_CACHE_HEADER, how);
  if (request.method === "HEAD") return new NextResponse(null, { status: a.status, headers });
  const separator = Buffer.from(nonce);
  const body = a.parts.length === 1 ? a.parts[0]! : Buffer.concat(a.parts.flatMap((part, i) => (i === 0 ? [part] : [separator, part])));
  // a Buffer is a Uint8Array; Next sends it as it is
  return new NextResponse(body as unknown as BodyInit, { status: a.status, headers });
}

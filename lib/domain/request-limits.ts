// The one table of request-body limits. Route handlers read their bodies through server/http/body.ts, which
// cuts a body off at its route's limit while it streams in; next.config.ts gives server actions and the
// proxy theirs from here; the photo and spreadsheet forms show the file limits. Plain data only: this
// file is imported by next.config.ts and by client components.

const KB = 1024;
const MB = 1024 * KB;

// Room a multipart form needs around its file: boundaries, part headers and the small text fields
// (a 300-character caption is the largest).
const FORM_ALLOWANCE = 64 * KB;

export interface BodyLimit {
  /** The largest body accepted, in bytes. */
  bytes: number;
  /** For file uploads: the largest file, the figure people are told. */
  fileBytes?: number;
  /** For file uploads: what to do with a file that is too large. */
  advice?: string;
  /** What a person reads when a body is over the limit. */
  tooLarge: string;
}

const mb = (bytes: number) => `${bytes / MB} MB`;
const PHOTO_FILE = 15 * MB;
const SPREADSHEET_FILE = 5 * MB;
const OBSERVATIONS = 1 * MB;
const PAGE_FORM = 1 * MB;
const PHOTO_ADVICE = "Choose a smaller size on your phone (most offer one when you share a photo) and attach it again.";
const SPREADSHEET_ADVICE = "Remove pictures or extra sheets, or upload a CSV.";

export const BODY_LIMITS = {
  /** POST /api/photos: one photo as phones take it, with its plot, caption and date. */
  photo: {
    bytes: PHOTO_FILE + FORM_ALLOWANCE,
    fileBytes: PHOTO_FILE,
    advice: PHOTO_ADVICE,
    tooLarge: `The photo is larger than the ${mb(PHOTO_FILE)} limit. ${PHOTO_ADVICE}`,
  },
  /** POST /api/record/:trialId/:siteId/upload: a filled-in sheet, xlsx or CSV. */
  spreadsheet: {
    bytes: SPREADSHEET_FILE + FORM_ALLOWANCE,
    fileBytes: SPREADSHEET_FILE,
    advice: SPREADSHEET_ADVICE,
    tooLarge: `The file is larger than the ${mb(SPREADSHEET_FILE)} limit. ${SPREADSHEET_ADVICE}`,
  },
  /** POST /api/observations: values typed in the data-entry form (it sends one at a time). */
  observations: {
    bytes: OBSERVATIONS,
    tooLarge: `Too much was sent at once (the limit is ${mb(OBSERVATIONS)}). Save fewer values at a time.`,
  },
  /** POST /api/auth/*: sign-in, sign-out and session requests, a few short fields. */
  auth: {
    bytes: 16 * KB,
    tooLarge: "The sign-in request is too large. Open the sign-in page and sign in again.",
  },
  /** Anything sent to a page: server actions (forms of text) and nothing else. */
  pageForm: {
    bytes: PAGE_FORM,
    tooLarge: `The form is larger than the ${mb(PAGE_FORM)} limit. Shorten the text and send it again.`,
  },
} as const satisfies Record<string, BodyLimit>;

export type BodyKind = keyof typeof BODY_LIMITS;

/**
 * How much of a page request's body Next copies for the proxy (proxyClientMaxBodySize). Next cuts that copy
 * at this size by dropping the chunk that crosses it, so it is set a margin (far more than one socket read)
 * above the page limit: a copy that was cut is then still over the limit and refused, never taken as whole.
 */
export const PROXY_BODY_COPY_BYTES = PAGE_FORM + 1 * MB;

/** The file limit people are told where they pick a file: "15 MB". */
export const statedFileLimit = (kind: "photo" | "spreadsheet") => mb(BODY_LIMITS[kind].fileBytes);

/** A file over its limit, in the forms before sending and in the server's own checks: "This photo is 18.4 MB; the limit is 15 MB. Choose a smaller size…" */
export const fileTooLarge = (kind: "photo" | "spreadsheet", bytes: number) =>
  `This ${kind === "photo" ? "photo" : "file"} is ${(bytes / MB).toFixed(1)} MB; the limit is ${statedFileLimit(kind)}. ${BODY_LIMITS[kind].advice}`;

import http from "node:http";
import { baseUrl } from "./browser";

export interface StreamedAnswer {
  status: number;
  text: string;
  /** How much of the body had been written when the answer came. */
  sentBytes: number;
}

const CHUNK = Buffer.alloc(64 * 1024);

/**
 * POSTs `totalBytes` of zeros, written 64 KiB at a time from one reused buffer so the test never holds the
 * body, with Transfer-Encoding: chunked and no length unless `declareLength`. Like browsers and curl, it
 * stops sending once the server has answered.
 */
export function streamZeros(path: string, totalBytes: number, opts: { headers?: Record<string, string>; declareLength?: boolean } = {}): Promise<StreamedAnswer> {
  const url = new URL(path, baseUrl);
  const headers: Record<string, string> = { ...opts.headers };
  if (opts.declareLength) headers["content-length"] = String(totalBytes);
  return new Promise((resolve, reject) => {
    let sent = 0;
    let answered = false;
    const req = http.request({ host: url.hostname, port: url.port, path: url.pathname + url.search, method: "POST", headers });
    req.on("response", (res) => {
      answered = true;
      const parts: Buffer[] = [];
      res.on("data", (d: Buffer) => parts.push(d));
      res.on("end", () => {
        req.destroy();
        resolve({ status: res.statusCode ?? 0, text: Buffer.concat(parts).toString("utf8"), sentBytes: sent });
      });
      res.on("error", reject);
    });
    req.on("error", (e) => {
      if (!answered) reject(new Error(`${path}: the connection failed after ${sent} bytes, before any answer: ${e.message}`));
    });
    const pump = () => {
      while (!answered && sent < totalBytes) {
        const n = Math.min(CHUNK.length, totalBytes - sent);
        sent += n;
        if (!req.write(n === CHUNK.length ? CHUNK : CHUNK.subarray(0, n))) {
          req.once("drain", pump);
          return;
        }
      }
      if (!answered) req.end();
    };
    pump();
  });
}

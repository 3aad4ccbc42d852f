import "server-only";
import http from "node:http";
import { AsyncLocalStorage } from "node:async_hooks";
import { env } from "@/lib/env";
import { clientAddressFrom, trustedProxyMatcher, UNKNOWN_ADDRESS } from "./client-address";

// Route handlers and server actions cannot see the socket a request came on, and the X-Forwarded-For
// header Next passes them is whatever the client sent. So the address is worked out where the socket is
// still known (the HTTP server's "request" event) and carried with the request's async work. Kept on
// globalThis because Next bundles instrumentation and routes separately, each with its own module copies.
const globalKey = Symbol.for("seedplot.clientAddress");
type Holder = { storage: AsyncLocalStorage<string>; installed: boolean; warned: boolean };
const holder: Holder = ((globalThis as Record<symbol, unknown>)[globalKey] as Holder | undefined) ??
  ((globalThis as Record<symbol, unknown>)[globalKey] = { storage: new AsyncLocalStorage<string>(), installed: false, warned: false } satisfies Holder);

const isTrustedProxy = trustedProxyMatcher(env.TRUSTED_PROXIES);

/**
 * Makes every HTTP server in this process record each request's client address before Next sees it.
 * Called once from instrumentation.ts when the server starts.
 */
export function installClientAddressTracking() {
  if (holder.installed) return;
  holder.installed = true;
  const proto = http.Server.prototype as unknown as { emit: (event: string | symbol, ...args: unknown[]) => boolean };
  const emit = proto.emit;
  proto.emit = function (this: http.Server, event: string | symbol, ...args: unknown[]) {
    if (event !== "request") return emit.call(this, event, ...args);
    const req = args[0] as http.IncomingMessage;
    const address = clientAddressFrom(req.socket?.remoteAddress, req.headers["x-forwarded-for"], isTrustedProxy);
    return holder.storage.run(address, () => emit.call(this, event, ...args));
  };
}

/** Runs `work` as if it were a request from `address` (scripts and tests that call actions directly). */
export function runAsClientAddress<T>(address: string, work: () => T): T {
  return holder.storage.run(address, work);
}

/**
 * The address of the client making the current request, for per-address limits: the connection's own
 * address, or what trusted proxies (TRUSTED_PROXIES) say it is. Never a value the client chose.
 */
export function requestAddress(): string {
  const address = holder.storage.getStore();
  if (address) return address;
  if (!holder.warned) {
    holder.warned = true;
    console.warn("[auth] a request arrived without a known client address; per-address limits share one budget for such requests");
  }
  return UNKNOWN_ADDRESS;
}

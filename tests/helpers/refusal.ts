import { isAppError, type AppError } from "@/lib/errors";

/** The AppError a call is refused with; fails the test when the call succeeds or throws anything else. */
export async function refusal(p: Promise<unknown>): Promise<AppError> {
  try {
    await p;
  } catch (e) {
    if (isAppError(e)) return e;
    throw e;
  }
  throw new Error("expected a refusal");
}

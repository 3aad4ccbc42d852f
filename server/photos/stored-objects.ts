import "server-only";
import { getStorage } from "@/server/storage";

/**
 * Deletes the stored objects of photo rows already deleted and committed. Rows go first, objects after, so a
 * failure in between leaves at worst an unreferenced object, never a row pointing at nothing; such a
 * failure is logged with its key for cleanup and does not undo the change the user made.
 */
export async function deleteStoredPhotos(keys: readonly string[]): Promise<void> {
  const storage = getStorage();
  await Promise.all(
    keys.map((key) => storage.delete(key).catch((e: unknown) => console.error(`[photos] object ${key} left behind:`, e instanceof Error ? e.message : e))),
  );
}

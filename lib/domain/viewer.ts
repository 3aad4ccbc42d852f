import type { Locale, Role } from "@/lib/domain/vocabulary/enums";

/** The signed-in person as the rest of the app sees them. */
export interface Viewer {
  id: number;
  email: string;
  name: string;
  role: Role;
  /** Their language for screens, mails and printouts; absent means English. */
  locale?: Locale;
}

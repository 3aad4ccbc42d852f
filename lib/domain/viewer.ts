import type { Role } from "@/lib/domain/vocabulary/enums";

/** The signed-in person as the rest of the app sees them. */
export interface Viewer {
  id: number;
  email: string;
  name: string;
  role: Role;
}

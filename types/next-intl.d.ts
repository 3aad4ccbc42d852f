import type { Messages } from "@/lib/domain/i18n/catalogue";
import type { Locale } from "@/lib/domain/vocabulary/enums";

declare module "next-intl" {
  interface AppConfig {
    Locale: Locale;
    Messages: Messages;
  }
}

// The message catalogue (messages/<locale>.json, ICU syntax) and one translator per language, for code that
// runs outside React: mails, printouts, spreadsheets and the checks behind upload messages. Pages and
// components use next-intl's getTranslations / useTranslations over the same catalogue.
import { createTranslator } from "use-intl/core";
import en from "@/messages/en.json";
import es from "@/messages/es.json";
import type { Locale } from "@/lib/domain/vocabulary/enums";
import { DEFAULT_LOCALE } from "./locales";

export { DEFAULT_LOCALE, isLocale, localeOr } from "./locales";

export type Messages = typeof en;

/** English is the source; every other catalogue has the same keys and placeholders (tests/unit/i18n). */
export const CATALOGUES: Record<Locale, Messages> = { en, es: es as Messages };

const translators = new Map<Locale, Translator>();

/** All messages of one language, read by key: `t("upload.rowProblem", { row: 3 })`. */
export function translatorFor(locale: Locale = DEFAULT_LOCALE): Translator {
  let t = translators.get(locale);
  if (!t) {
    t = Object.assign(createTranslator({ locale, messages: CATALOGUES[locale], timeZone: "UTC" }), { locale });
    translators.set(locale, t);
  }
  return t;
}

/** A translator that also says its language (for dates and numbers formatted beside the messages). */
export type Translator = ReturnType<typeof createTranslator<Messages>> & { locale: Locale };

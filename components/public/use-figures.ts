import { useLocale, useTranslations } from "next-intl";
import { figuresFor, type Figures } from "@/lib/domain/i18n/figures";
import { localeOr } from "@/lib/domain/i18n/locales";

/** Figures with units in the page's language, for the public pages' components, server or client (see lib/domain/i18n/figures.ts). */
export function useFigures(): Figures {
  const locale = localeOr(useLocale());
  const figure = useTranslations("figures");
  const units = useTranslations("units");
  return figuresFor(locale, {
    figure: (key, values) => figure(key, values),
    unit: (unit) => (units.has(unit as never) ? units(unit as never) : unit),
  });
}

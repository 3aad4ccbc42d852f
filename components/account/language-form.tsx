"use client";
import { useActionState } from "react";
import { useTranslations } from "next-intl";
import { SelectField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { setMyLanguage } from "@/server/actions/account";
import { LOCALES, type Locale } from "@/lib/domain/vocabulary/enums";

/** The viewer's own language: screens, e-mails and printouts. */
export function LanguageForm({ current }: { current: Locale }) {
  const [state, action] = useActionState(setMyLanguage, null);
  const t = useTranslations("account");
  const names = useTranslations("languages");
  const common = useTranslations("common");
  const failed = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="max-w-md space-y-3">
      <SelectField label={t("languageLabel")} name="locale" defaultValue={failed?.values?.locale ?? current} errors={failed?.fieldErrors?.locale} hint={t("languageHelp")}>
        {LOCALES.map((l) => (
          <option key={l} value={l} lang={l}>
            {names(l)}
          </option>
        ))}
      </SelectField>
      <FormMessage state={state} />
      <SubmitButton pendingText={common("saving")}>{t("save")}</SubmitButton>
    </form>
  );
}

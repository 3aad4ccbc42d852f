import Link from "next/link";
import { getLocale, getTranslations } from "next-intl/server";
import { buttonClasses } from "@/components/ui/button";
import { listPublicTrials } from "@/server/publish/public-snapshots";
import { OPENAPI_PATH } from "@/lib/domain/publish/open-data";
import { withLanguage } from "@/lib/domain/i18n/language-choice";
import { localeOr } from "@/lib/domain/i18n/locales";

export const dynamic = "force-dynamic";

const STEPS = ["step1", "step2", "step3", "step4"] as const;
const FACTS = [
  ["factSites", "factSitesText"],
  ["factBlind", "factBlindText"],
  ["factBlocks", "factBlocksText"],
  ["factOpen", "factOpenText"],
] as const;

export default async function HomePage() {
  const locale = localeOr(await getLocale());
  const [{ trials }, t] = await Promise.all([listPublicTrials({}, locale), getTranslations("publicPages")]);
  const latest = trials.slice(0, 4);
  const here = (href: string) => withLanguage(href, locale);
  return (
    <div>
      <section className="bg-loam-900 text-white">
        <div className="mx-auto grid max-w-6xl gap-8 px-4 py-14 md:grid-cols-[3fr_2fr] md:py-20">
          <div>
            <p className="text-sm font-semibold uppercase tracking-widest text-marigold-400">{t("homeRegion")}</p>
            <h1 className="mt-3 text-4xl font-bold leading-tight md:text-5xl">{t("homeTitle")}</h1>
            <p className="mt-5 max-w-2xl text-lg text-loam-100">{t("homeIntro")}</p>
            <div className="mt-8 flex flex-wrap gap-3">
              <Link href={here("/results")} className={buttonClasses("primary")}>
                {t("seeResults")}
              </Link>
              <Link href={here("/sign-in")} className={buttonClasses("secondary")}>
                {t("partnerSignIn")}
              </Link>
            </div>
          </div>
          <dl className="grid grid-cols-2 gap-4 self-end">
            {FACTS.map(([term, detail]) => (
              <div key={term} className="rounded-xl bg-loam-700 p-4">
                <dt className="font-bold text-white">{t(term)}</dt>
                <dd className="mt-1 text-sm text-loam-100">{t(detail)}</dd>
              </div>
            ))}
          </dl>
        </div>
      </section>
      {latest.length > 0 && (
        <section className="mx-auto max-w-6xl px-4 pt-12" aria-labelledby="latest">
          <h2 id="latest" className="text-2xl font-bold">{t("latestResults")}</h2>
          <ul className="mt-4 grid gap-4 md:grid-cols-2">
            {latest.map((trial) => (
              <li key={trial.code} className="rounded-xl border border-husk-200 bg-white p-5">
                <p className="text-sm font-semibold text-sprout-700">{trial.crop} · {trial.season}</p>
                <h3 className="mt-1 text-lg font-bold"><Link href={here(`/results/${trial.code}`)}>{trial.title}</Link></h3>
                <p className="mt-2">{trial.summary}</p>
              </li>
            ))}
          </ul>
          <p className="mt-4 text-sm text-loam-700">
            <Link href={here("/results")}>{t("allPublished")}</Link> · {t("openDataLead")} <a href={OPENAPI_PATH}>{t("openDataLink")}</a>
          </p>
        </section>
      )}
      <section className="mx-auto max-w-6xl px-4 py-12" aria-labelledby="how">
        <h2 id="how" className="text-2xl font-bold">{t("howSeason")}</h2>
        <ol className="mt-6 grid gap-4 md:grid-cols-4">
          {STEPS.map((step, i) => (
            <li key={step} className="rounded-xl border border-husk-200 bg-white p-5">
              <span className="inline-flex size-8 items-center justify-center rounded-full bg-sprout-600 font-bold text-white">{i + 1}</span>
              <h3 className="mt-3 font-bold">{t(step)}</h3>
              <p className="mt-1 text-loam-700">{t(`${step}Text`)}</p>
            </li>
          ))}
        </ol>
        <p className="mt-8 max-w-3xl text-loam-700">{t("hostTrial")}</p>
      </section>
    </div>
  );
}

import type { Metadata } from "next";
import { requireUser } from "@/server/auth/guards";
import { listMyPublishedTrials, listMySites, listTrialsForViewer } from "@/db/queries/overview";
import { listLateSites, listMySchedules } from "@/server/observations/schedules";
import { listUsersForAdmin } from "@/db/queries/users";
import { listMyLayouts } from "@/db/queries/trials";
import { getTranslations } from "next-intl/server";
import { Card } from "@/components/ui/card";
import { LateSitesList, MyLayouts, MySchedules, SectionLink, TrialsTable, UsersSummary } from "@/components/portal/home-sections";

export const metadata: Metadata = { title: "Portal" };

export default async function PortalHome() {
  const viewer = await requireUser();

  if (viewer.role === "cooperator") {
    const [schedules, sites, layouts, published, t] = await Promise.all([listMySchedules(viewer), listMySites(viewer), listMyLayouts(viewer), listMyPublishedTrials(viewer), getTranslations("home")]);
    return (
      <div className="space-y-6">
        <h1 className="text-3xl font-bold">{t("hello", { name: viewer.name.split(" ")[0]! })}</h1>
        <p className="text-loam-700">{t("intro")}</p>
        <MySchedules schedules={schedules} sites={sites} published={published} />
        {layouts.length > 0 && (
          <Card title={t("printables")}>
            <MyLayouts layouts={layouts} />
          </Card>
        )}
      </div>
    );
  }

  const [trials, lateSites, users] = await Promise.all([
    listTrialsForViewer(viewer),
    listLateSites(viewer),
    viewer.role === "admin" ? listUsersForAdmin(viewer) : Promise.resolve([]),
  ]);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">{viewer.role === "admin" ? "Administration" : "Program overview"}</h1>
      {viewer.role === "admin" && (
        <Card title="Users and roles" actions={<SectionLink href="/portal/admin/users">Manage users</SectionLink>}>
          <UsersSummary users={users} />
        </Card>
      )}
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr] [&>*]:min-w-0">
        <Card title="Trials">
          <TrialsTable trials={trials} />
        </Card>
        <Card title="Sites behind schedule">
          <LateSitesList sites={lateSites} />
        </Card>
      </div>
    </div>
  );
}

import "server-only";
import { db } from "@/db/index";
import { getRecordableEnrolment } from "@/db/queries/observations";
import { listReminderTargets } from "@/db/queries/review";
import { insertAudit } from "@/db/audit";
import { insertMail } from "@/db/mutations/mail";
import { hasReminderBeenSent, listGrowerRecipients } from "@/db/mutations/review";
import type { Viewer } from "@/lib/domain/viewer";
import { reminderMail } from "@/lib/domain/mail/observation-mails";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { addDays, todayIso } from "@/lib/domain/schedule";
import { getRecordingSheet } from "@/server/observations/sheet";
import { recordLink } from "./submissions";
import { formatDate } from "@/lib/domain/vocabulary/labels";

// The reminder job reads every active site; it acts for the program, not for a signed-in person.
const SYSTEM_READER: Viewer = { id: 0, email: "system@seedplot.invalid", name: "Seedplot", role: "admin" };

/**
 * Queues one reminder per grower and site for counts due tomorrow or overdue, at most once a day per
 * site: the audit log remembers which days were already reminded. Returns how many messages were queued.
 */
export async function insertDueReminders(p: { today?: string; appUrl: string }) {
  const today = p.today ?? todayIso();
  const tomorrow = addDays(today, 1);
  let queued = 0;
  for (const target of await listReminderTargets()) {
    const sheet = await getRecordingSheet(SYSTEM_READER, target, today);
    if (!sheet || sheet.submission?.status === "submitted" || sheet.submission?.status === "accepted") continue;
    const dueTomorrow = sheet.due.filter((d) => d.status !== "done" && d.dueOn === tomorrow);
    const overdue = sheet.due.filter((d) => d.status === "late");
    if (dueTomorrow.length === 0 && overdue.length === 0) continue;
    queued += await db.transaction(async (tx) => {
      const enrolment = await getRecordableEnrolment(tx, SYSTEM_READER, target, true);
      if (!enrolment) return 0;
      if (await hasReminderBeenSent(tx, { enrolmentId: enrolment.enrolmentId, day: today })) return 0;
      const recipients = await listGrowerRecipients(tx, enrolment);
      for (const g of recipients) {
        // Each grower reads the counts in their own language (trait names, dates and the frame).
        const t = translatorFor(g.locale);
        const theirs = g.locale === "en" ? sheet : ((await getRecordingSheet({ ...SYSTEM_READER, locale: g.locale }, target, today)) ?? sheet);
        const inTheirWords = (d: (typeof overdue)[number]) => theirs.due.find((x) => x.traitId === d.traitId && x.occasion === d.occasion) ?? d;
        const label = (d: (typeof overdue)[number]) => {
          const item = inTheirWords(d);
          return t("mail.reminderItem", { label: item.label, date: formatDate(item.dueOn, g.locale), missing: String(item.expected - item.recorded), expected: String(item.expected) });
        };
        await insertMail(tx, reminderMail({ to: g.email, name: g.name, siteName: enrolment.siteName, trialTitle: enrolment.trialTitle, tomorrow: dueTomorrow.map(label), overdue: overdue.map(label), link: recordLink(p, enrolment), locale: g.locale }));
      }
      await insertAudit(tx, { actorId: null, action: "reminder.sent", entity: "enrolment", entityId: enrolment.enrolmentId, trialId: enrolment.trialId, newValue: { day: today, to: recipients.length, tomorrow: dueTomorrow.length, overdue: overdue.length } });
      return recipients.length;
    });
  }
  return queued;
}

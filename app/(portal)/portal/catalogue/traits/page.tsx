import type { Metadata } from "next";
import Link from "next/link";
import { requireRole } from "@/server/auth/guards";
import { listTraits } from "@/db/queries/catalogue";
import { listProgramOptions } from "@/db/queries/programs";
import { Card } from "@/components/ui/card";
import { TraitTable } from "@/components/catalogue/catalogue-tables";
import { TraitForm } from "@/components/catalogue/catalogue-forms";

export const metadata: Metadata = { title: "Trait library" };

export default async function TraitsPage() {
  const viewer = await requireRole("coordinator", "admin");
  const [traits, programs] = await Promise.all([listTraits(viewer), listProgramOptions(viewer)]);
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/portal/catalogue">← Catalogue</Link>
      </p>
      <h1 className="text-3xl font-bold">Trait library</h1>
      <p className="text-loam-700">What growers can be asked to record. Built-in traits are shared by every program; traits you add belong to your program, and only its trials can use them.</p>
      <Card title="Traits">
        <TraitTable rows={traits} />
      </Card>
      <Card title="Add a trait">
        <TraitForm programs={programs} />
      </Card>
    </div>
  );
}

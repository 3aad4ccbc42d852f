import type { Metadata } from "next";
import Link from "next/link";
import { requireRole } from "@/server/auth/guards";
import { listCrops, listSeedLots, listVarieties } from "@/db/queries/catalogue";
import { listProgramOptions } from "@/db/queries/programs";
import { Card } from "@/components/ui/card";
import { CropTable, SeedLotTable, VarietyTable } from "@/components/catalogue/catalogue-tables";
import { CropForm, SeedLotForm, VarietyForm } from "@/components/catalogue/catalogue-forms";

export const metadata: Metadata = { title: "Catalogue" };

export default async function CataloguePage() {
  const viewer = await requireRole("coordinator", "admin");
  const [crops, varieties, lots, programs] = await Promise.all([listCrops(viewer), listVarieties(viewer), listSeedLots(viewer), listProgramOptions(viewer)]);
  const cropOptions = crops.map(({ id, name }) => ({ id, name }));
  const varietyOptions = varieties.map(({ id, name, crop }) => ({ id, name, crop }));
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-3xl font-bold">Catalogue</h1>
        <Link href="/portal/catalogue/traits" className="font-semibold">
          Trait library
        </Link>
      </div>
      <p className="text-loam-700">
        Crops, varieties and the seed lots that go into trial kits. Crops are shared by every program; varieties and seed lots are your program&apos;s own. Variety names stay with staff; growers only see blind codes.
      </p>
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr] [&>*]:min-w-0">
        <Card title="Crops">
          <CropTable rows={crops} />
        </Card>
        <Card title="Add a crop">
          <CropForm />
        </Card>
        <Card title="Varieties">
          <VarietyTable rows={varieties} crops={cropOptions} />
        </Card>
        <Card title="Add a variety">
          <VarietyForm crops={cropOptions} programs={programs} />
        </Card>
      </div>
      <Card title="Seed lots">
        <SeedLotTable rows={lots} varieties={varietyOptions} />
      </Card>
      <Card title="Record a seed lot">
        <SeedLotForm varieties={varietyOptions} />
      </Card>
    </div>
  );
}

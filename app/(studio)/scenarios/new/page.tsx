import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requireCapability } from "@/app/_lib/dal";
import { orNotFound } from "@/app/_lib/policy/for-page";
import { loadBenchForNewScenario } from "@/app/_lib/policy/scenario";
import { ScenarioEditor } from "@/components/scenario-editor/scenario-editor";
import { PageHeader } from "@/components/ui/page-header";
import { editorBench } from "../bench-facts";

export const metadata: Metadata = { title: "New scenario" };

/** /scenarios/new?benchId=...: a draft scenario for a bench, saved on "Create scenario". */
export default async function NewScenarioPage({
  searchParams,
}: {
  searchParams: Promise<{ benchId?: string }>;
}) {
  const { benchId } = await searchParams;
  const session = await requireCapability("scenarios.edit");
  if (!benchId) notFound();
  const bench = orNotFound(() => loadBenchForNewScenario(session, benchId));
  const draft = {
    format: 1,
    name: "New scenario",
    bench: { name: bench.name },
    steps: [{ kind: "wait", for: "1s" }],
  };
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-6 px-6 py-8 md:px-10">
      <PageHeader title="New scenario" lead={`On ${bench.name}.`} />
      <ScenarioEditor
        scenarioId={null}
        initialDocument={draft}
        bench={editorBench(bench)}
        canEdit
        canRun={false}
      />
    </div>
  );
}

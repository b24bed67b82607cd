import type {
  TraceConsumptionDto,
  TraceNonconformanceDto,
  TraceStepRunDto,
  UnitTraceDto,
} from '@shared/schemas/trace'

export interface StepGroup {
  position: number
  name: string
  runs: TraceStepRunDto[]
}

/** Step runs grouped by route step in route order, each group's runs in time order. */
export function groupByStep(trace: UnitTraceDto): StepGroup[] {
  const groups = new Map<string, StepGroup>()
  for (const r of trace.stepRuns) {
    const g = groups.get(r.stepId) ?? { position: r.stepPosition, name: r.stepName, runs: [] }
    g.runs.push(r)
    groups.set(r.stepId, g)
  }
  return [...groups.values()].sort((a, b) => a.position - b.position)
}

/** Lookups from a step run to what it fitted and the nonconformance it opened. */
export function runIndex(trace: UnitTraceDto) {
  const parts = new Map<string, TraceConsumptionDto[]>()
  for (const c of trace.consumptions) parts.set(c.stepRunId, [...(parts.get(c.stepRunId) ?? []), c])
  const ncs = new Map<string, TraceNonconformanceDto>()
  for (const n of trace.nonconformances) ncs.set(n.stepRunId, n)
  return {
    consumptionsOf: (runId: string) => parts.get(runId) ?? [],
    nonconformanceOf: (runId: string) => ncs.get(runId),
  }
}

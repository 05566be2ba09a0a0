import { randomBytes } from 'node:crypto'
import type { DataSource } from 'typeorm'
import { In } from 'typeorm'
import type { Page } from '../../shared/contracts/admin.contract'
import type { SessionUser, UnitSystem } from '../../shared/contracts/auth.contract'
import type { RunChanges, RunResult, StudyInput, StudyRecord, StudyRunRecord, StudySummary } from '../../shared/contracts/study.contract'
import { StudyInputError } from '../../shared/selection/air'
import { runSelection, type SelectionResult } from '../../shared/selection/run-selection'
import { SelectionPoolError, type SelectionPool } from '../selection/selection-pool'
import { EngineeringInputError } from '../../shared/engineering'
import { fromSI } from '../../shared/engineering'
import { DutyStudy, StudyRun } from '../db/entities'
import { ConflictError, NotFoundError, ValidationError } from '../http/errors'
import type { CatalogueService } from './catalogue.service'

const isStaff = (user: SessionUser) => user.role === 'admin' || user.role === 'sales'

function toSummary(study: DutyStudy, lastRun: StudyRun | undefined): StudySummary {
  return {
    id: study.id,
    name: study.name,
    ownerName: study.owner.name,
    organisationName: study.organisation.name,
    updatedAt: study.updatedAt.toISOString(),
    lastRunAt: lastRun ? lastRun.createdAt.toISOString() : null,
    candidateCount: lastRun ? lastRun.candidateCount : null,
    shared: study.shareToken !== null,
  }
}

function compareRuns(previous: StudyRun, current: RunResult): RunChanges {
  const key = (candidate: { partNumber: string; tap: string }) => `${candidate.partNumber} (${candidate.tap})`
  const before = new Map(previous.result.candidates.map((candidate) => [key(candidate), candidate]))
  const after = new Map(current.candidates.map((candidate) => [key(candidate), candidate]))
  const moved: RunChanges['moved'] = []
  const flowChanged: RunChanges['flowChanged'] = []
  for (const [name, candidate] of after) {
    const old = before.get(name)
    if (!old) continue
    if (old.rank !== candidate.rank) moved.push({ partNumber: name, fromRank: old.rank, toRank: candidate.rank })
    if (Math.abs(old.nominal.flowM3s - candidate.nominal.flowM3s) > 1e-6 * Math.max(1e-9, old.nominal.flowM3s)) {
      flowChanged.push({ partNumber: name, fromM3s: old.nominal.flowM3s, toM3s: candidate.nominal.flowM3s })
    }
  }
  return {
    previousRunId: previous.id,
    catalogueChanged: previous.catalogueRevision !== current.catalogueRevision,
    added: [...after.keys()].filter((name) => !before.has(name)),
    removed: [...before.keys()].filter((name) => !after.has(name)),
    moved,
    flowChanged,
  }
}

export interface StudySolving {
  /** Worker threads for big catalogues (absent: every run in this thread). */
  pool?: SelectionPool
  /** Catalogues with fewer variants than this run in this thread. */
  poolMinVariants?: number
  log?: (error: unknown) => void
}

/** A run's answer as JSON text (what a route sends) and as an object (what is stored), each made from the other once, on first use. */
export class SolvedRun {
  private constructor(
    private text: string | undefined,
    private value: RunResult | undefined,
  ) {}

  static of(value: RunResult): SolvedRun {
    return new SolvedRun(undefined, value)
  }

  static ofJson(text: string): SolvedRun {
    return new SolvedRun(text, undefined)
  }

  json(): string {
    this.text ??= JSON.stringify(this.value)
    return this.text
  }

  result(): RunResult {
    if (this.value === undefined) {
      const parsed: RunResult = JSON.parse(this.text ?? 'null')
      this.value = parsed
    }
    return this.value
  }
}

export class StudyService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly catalogue: CatalogueService,
    private readonly solving: StudySolving = {},
  ) {}

  private get studies() {
    return this.dataSource.getRepository(DutyStudy)
  }

  private get runs() {
    return this.dataSource.getRepository(StudyRun)
  }

  /** Solves the study over the current catalogue. Bad combinations of inputs become field errors. */
  async solve(input: StudyInput): Promise<RunResult> {
    return (await this.solveRun(input)).result()
  }

  /** solve(), kept in the form it was made in: JSON text from the worker pool, an object from this thread. */
  async solveRun(input: StudyInput): Promise<SolvedRun> {
    const started = performance.now()
    try {
      const { revision, selected } = await this.select(input)
      const run = { ranAt: new Date().toISOString(), durationMs: Math.round((performance.now() - started) * 10) / 10, catalogueRevision: revision }
      if (typeof selected !== 'string') return SolvedRun.of({ ...selected, ...run })
      // The run's own fields appended to the pool's text (an object's JSON ends in its closing brace).
      return SolvedRun.ofJson(`${selected.slice(0, -1)},${JSON.stringify(run).slice(1)}`)
    } catch (error) {
      if (error instanceof StudyInputError) throw new ValidationError({ [`input.${error.field}`]: error.message }, 'The study inputs do not fit together')
      if (error instanceof EngineeringInputError) throw new ValidationError({ [`input.${error.field}`]: error.message }, 'The study inputs do not fit together')
      throw error
    }
  }

  /**
   * The selection over the current catalogue: in the worker pool for a big catalogue (its JSON
   * text; the workers prepare their shares, this thread never does), else here (an object).
   */
  private async select(input: StudyInput): Promise<{ revision: number; selected: SelectionResult | string }> {
    const { pool, poolMinVariants = 0, log = console.error } = this.solving
    if (pool) {
      const { revision, sources } = await this.catalogue.catalogueSources()
      if (sources.length >= poolMinVariants) {
        try {
          return { revision, selected: await pool.runJson(revision, sources, input) }
        } catch (error) {
          if (!(error instanceof SelectionPoolError)) throw error
          // The same answer from this thread; the pool starts new workers on the next run.
          log(error)
        }
      }
    }
    const { revision, entries } = await this.catalogue.solverCatalogue()
    return { revision, selected: runSelection(entries, input) }
  }

  private async findReadable(user: SessionUser, id: string): Promise<DutyStudy> {
    const study = await this.studies.findOne({ where: { id }, relations: { owner: true, organisation: true } })
    // Another organisation's study is answered as missing, not forbidden, so ids reveal nothing.
    if (!study) throw new NotFoundError('Duty study')
    if (isStaff(user)) return study
    if (study.organisationId !== user.organisation.id) throw new NotFoundError('Duty study')
    if (study.ownerId !== user.id && study.shareToken === null) throw new NotFoundError('Duty study')
    return study
  }

  private async findOwned(user: SessionUser, id: string): Promise<DutyStudy> {
    const study = await this.findReadable(user, id)
    if (study.ownerId !== user.id) throw new NotFoundError('Duty study')
    return study
  }

  private async record(study: DutyStudy, user: SessionUser): Promise<StudyRecord> {
    const runs = await this.runs.find({ where: { studyId: study.id }, order: { createdAt: 'DESC' }, select: { id: true, createdAt: true, candidateCount: true }, take: 50 })
    return {
      ...toSummary(study, runs[0]),
      version: study.version,
      input: study.input,
      shareToken: study.ownerId === user.id ? study.shareToken : null,
      runs: runs.map((run) => ({ id: run.id, ranAt: run.createdAt.toISOString(), candidateCount: run.candidateCount })),
      editable: study.ownerId === user.id,
    }
  }

  async list(user: SessionUser, page: number, pageSize: number, search?: string): Promise<Page<StudySummary>> {
    const builder = this.studies
      .createQueryBuilder('study')
      .innerJoinAndSelect('study.owner', 'owner')
      .innerJoinAndSelect('study.organisation', 'organisation')
      .orderBy('study.updatedAt', 'DESC')
      .skip((page - 1) * pageSize)
      .take(pageSize)
    if (!isStaff(user)) {
      builder.andWhere('study.organisationId = :org', { org: user.organisation.id })
      builder.andWhere('(study.ownerId = :me OR study.shareToken IS NOT NULL)', { me: user.id })
    }
    if (search) builder.andWhere('study.name LIKE :term', { term: `%${search.replace(/[\\%_]/g, '\\$&')}%` })
    const [studies, total] = await builder.getManyAndCount()
    const lastRuns = new Map<string, StudyRun>()
    if (studies.length > 0) {
      const runs = await this.runs.find({
        where: { studyId: In(studies.map((study) => study.id)) },
        order: { createdAt: 'DESC' },
        select: { id: true, studyId: true, createdAt: true, candidateCount: true },
      })
      for (const run of runs) if (!lastRuns.has(run.studyId)) lastRuns.set(run.studyId, run)
    }
    return { items: studies.map((study) => toSummary(study, lastRuns.get(study.id))), total, page, pageSize }
  }

  async create(user: SessionUser, input: StudyInput): Promise<StudyRecord> {
    const study = await this.studies.save(this.studies.create({ organisationId: user.organisation.id, ownerId: user.id, name: input.name, input, shareToken: null }))
    return this.get(user, study.id)
  }

  async get(user: SessionUser, id: string): Promise<StudyRecord> {
    return this.record(await this.findReadable(user, id), user)
  }

  async update(user: SessionUser, id: string, input: StudyInput, version: number): Promise<StudyRecord> {
    const study = await this.findOwned(user, id)
    // Optimistic lock: the UPDATE only matches the version the editor loaded.
    const result = await this.studies
      .createQueryBuilder()
      .update(DutyStudy)
      .set({ input, name: input.name, version: () => 'version + 1' })
      .where('id = :id AND version = :version', { id: study.id, version })
      .execute()
    if (!result.affected) throw new ConflictError('Someone saved this study after you opened it; reload to see their changes', 'stale_version')
    return this.get(user, id)
  }

  async remove(user: SessionUser, id: string): Promise<void> {
    const study = await this.findOwned(user, id)
    await this.studies.delete({ id: study.id })
  }

  async run(user: SessionUser, id: string): Promise<StudyRunRecord> {
    const study = await this.findOwned(user, id)
    const result = await this.solve(study.input)
    const previous = await this.runs.findOne({ where: { studyId: study.id }, order: { createdAt: 'DESC' } })
    const changes = previous ? compareRuns(previous, result) : null
    const run = await this.runs.save(
      this.runs.create({ studyId: study.id, ranById: user.id, input: study.input, catalogueRevision: result.catalogueRevision, candidateCount: result.candidates.length, result, changes }),
    )
    return { id: run.id, studyId: study.id, result, changes }
  }

  async getRun(user: SessionUser, studyId: string, runId: string): Promise<StudyRunRecord> {
    const study = await this.findReadable(user, studyId)
    const run = await this.runs.findOneBy({ id: runId, studyId: study.id })
    if (!run) throw new NotFoundError('Run')
    return { id: run.id, studyId: study.id, result: run.result, changes: run.changes }
  }

  async share(user: SessionUser, id: string, on: boolean): Promise<StudyRecord> {
    const study = await this.findOwned(user, id)
    await this.studies.update({ id: study.id }, { shareToken: on ? (study.shareToken ?? randomBytes(32).toString('base64url')) : null })
    return this.get(user, id)
  }

  async shared(user: SessionUser, token: string): Promise<StudyRecord & { latestRun: StudyRunRecord | null }> {
    const study = await this.studies.findOne({ where: { shareToken: token }, relations: { owner: true, organisation: true } })
    if (!study || (!isStaff(user) && study.organisationId !== user.organisation.id)) throw new NotFoundError('Shared duty study')
    const latest = await this.runs.findOne({ where: { studyId: study.id }, order: { createdAt: 'DESC' } })
    const record = await this.record(study, user)
    return {
      ...record,
      shareToken: null,
      editable: false,
      latestRun: latest ? { id: latest.id, studyId: study.id, result: latest.result, changes: latest.changes } : null,
    }
  }

  async exportCsv(user: SessionUser, studyId: string, runId: string, units: UnitSystem): Promise<{ name: string; csv: string }> {
    const study = await this.findReadable(user, studyId)
    const { result } = await this.getRun(user, studyId, runId)
    return { name: `${study.name.replace(/[^A-Za-z0-9_-]+/g, '-').slice(0, 60) || 'study'}-run.csv`, csv: candidatesCsv(study.input, result, units) }
  }
}

function cell(value: string | number | boolean | null): string {
  if (value === null) return ''
  const text = typeof value === 'number' ? (Number.isInteger(value) ? String(value) : value.toFixed(4)) : String(value)
  // Quote per RFC 4180; a leading =, +, - or @ is prefixed so spreadsheets do not run it as a formula.
  const safe = /^[=+\-@]/.test(text) && typeof value !== 'number' ? `'${text}` : text
  return /[",\n\r]/.test(safe) ? `"${safe.replaceAll('"', '""')}"` : safe
}

/** The candidates as CSV, SI and US customary columns both, the user's system first. */
export function candidatesCsv(input: StudyInput, result: RunResult, units: UnitSystem): string {
  const si = [
    ['flow_m3h', (m3s: number) => m3s * 3600],
    ['static_Pa', (pa: number) => pa],
  ] as const
  const us = [
    ['flow_cfm', (m3s: number) => fromSI(m3s, 'CFM')],
    ['static_inH2O', (pa: number) => fromSI(pa, 'inH2O')],
  ] as const
  const systems = units === 'us' ? [us, si] : [si, us]
  const header = ['rank', 'part_number', 'name', 'type', 'poles', 'tap', 'meets_duty', 'rpm']
  for (const system of systems) for (const [name] of system) header.push(name)
  header.push('margin_pct', 'low_line_rpm')
  for (const system of systems) header.push(`low_line_${system[0][0]}`)
  header.push('low_line_margin_pct', 'input_W', 'current_A', 'efficiency_pct', 'power_factor', 'energy_kWh_per_year', `energy_cost_per_year_${input.energy.currency}_minor`, 'warnings')
  const lines = [header.map(cell).join(',')]
  for (const candidate of result.candidates) {
    const row: (string | number | boolean | null)[] = [candidate.rank, candidate.partNumber, candidate.name, candidate.type, candidate.poles, candidate.tap, candidate.meetsDuty, candidate.nominal.rpm]
    for (const system of systems) {
      row.push(system[0][1](candidate.nominal.flowM3s), system[1][1](candidate.nominal.staticPa))
    }
    row.push(candidate.marginPct, candidate.lowLine.rpm)
    for (const system of systems) row.push(system[0][1](candidate.lowLine.flowM3s))
    row.push(
      candidate.lowLineMarginPct,
      candidate.nominal.inputW,
      candidate.nominal.currentA,
      candidate.nominal.efficiency === null ? null : candidate.nominal.efficiency * 100,
      candidate.nominal.powerFactor,
      candidate.energyPerYearKWh,
      candidate.energyPerYearMinor,
      candidate.warnings.map((warning) => warning.code).join(' '),
    )
    lines.push(row.map(cell).join(','))
  }
  return `${lines.join('\r\n')}\r\n`
}

import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form } from "react-router";
import { FormErrors } from "~/components/FormField";
import { PIN_ROLES } from "~/rules/ruleset";
import { VIDEO_MODES } from "~/rules/video-modes";
import { competitionFormSchema, type competitionToForm } from "../forms";
import { CellInput, CellSelect, Check, FieldError, Input, Select, TextArea } from "./fields";

type Defaults = ReturnType<typeof competitionToForm>;

/** The one form for a competition: dates, fee, criteria and the whole ruleset (pins and criteria as editable rows). */
export function CompetitionForm({
  lastResult,
  defaultValue,
  timeZone,
  submitLabel,
  busy,
  frozen,
}: {
  lastResult: SubmissionResult<string[]> | null | undefined;
  defaultValue: Defaults;
  timeZone: string;
  submitLabel: string;
  busy: boolean;
  frozen?: boolean;
}) {
  const schema = competitionFormSchema(timeZone);
  const [form, fields] = useForm({
    id: "competition",
    lastResult,
    defaultValue,
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema }),
  });
  const rs = fields.ruleset.getFieldset();
  const clock = rs.clock.getFieldset();
  const monitor = rs.monitor.getFieldset();
  const tile = rs.tile.getFieldset();
  const pinLayer = rs.pinLayer.getFieldset();
  const limits = rs.uploadLimits.getFieldset();
  const sim = rs.simulation.getFieldset();
  const flash = rs.flashCheck.getFieldset();
  const audio = rs.audio.getFieldset();
  const licence = rs.licence.getFieldset();
  const repo = rs.repository.getFieldset();
  const pins = rs.pins.getFieldList();
  const criteria = fields.criteria.getFieldList();

  return (
    <Form method="post" {...getFormProps(form)} className="space-y-6" data-testid="competition-form">
      <input type="hidden" name="intent" value="save" />
      <FormErrors errors={form.errors} />
      {frozen && (
        <p className="rounded-md border border-warn bg-warn-soft px-3 py-2 text-sm text-warn" role="note">
          Entries are closed: the deadline, fee, ruleset and criteria weights are frozen. Titles, texts and the voting window can still change.
        </p>
      )}

      <section className="card" aria-labelledby="compo-h">
        <h2 id="compo-h" className="mb-4 text-lg font-bold">The compo</h2>
        <div className="grid gap-x-4 sm:grid-cols-2">
          <Input field={fields.title} label="Title" />
          <Input field={fields.slug} label="Address (slug)" hint="Part of the public address; left empty, it is made from the title." />
        </div>
        <TextArea field={fields.description} label="Description" rows={3} />
      </section>

      <section className="card" aria-labelledby="dates-h">
        <h2 id="dates-h" className="mb-1 text-lg font-bold">Dates</h2>
        <p className="mb-4 text-sm text-mute">
          Enter times on the event's clock: <strong>{timeZone}</strong>. They are stored in UTC.
        </p>
        <div className="grid gap-x-4 sm:grid-cols-2">
          <Input field={fields.deadline} label="Submission deadline" type="datetime-local" />
          <Input field={fields.graceMinutes} label="Grace minutes" type="number" hint="Uploads that finish this long after the deadline still count." />
          <Input field={fields.votingOpens} label="Voting opens" type="datetime-local" />
          <Input field={fields.votingCloses} label="Voting closes" type="datetime-local" />
          <Input field={fields.showStarts} label="Show on the big screen" type="datetime-local" hint="On the party's public timetable and in its calendar." />
          <Input field={fields.showMinutes} label="Show length (minutes)" type="number" />
        </div>
      </section>

      <section className="card" aria-labelledby="fee-h">
        <h2 id="fee-h" className="mb-4 text-lg font-bold">Entry fee</h2>
        <Check field={fields.free} label="Free entry" />
        <div className="grid gap-x-4 sm:grid-cols-2">
          <Input field={fields.feeAmount} label="Amount" type="number" step="0.01" />
          <Input field={fields.feeCurrency} label="Currency (ISO 4217)" placeholder="EUR" />
        </div>
        <p className="text-xs text-mute">Fees, refunds and taxes follow local law; Gatecrash gives no legal advice.</p>
      </section>

      <section className="card" aria-labelledby="criteria-h">
        <h2 id="criteria-h" className="mb-4 text-lg font-bold">Judging criteria</h2>
        <FieldError field={fields.criteria} />
        <table className="w-full text-sm">
          <thead>
            <tr className="text-left text-mute">
              <th className="pb-2 font-medium">Name</th>
              <th className="pb-2 font-medium">Weight</th>
              <th className="pb-2 font-medium">Scale from</th>
              <th className="pb-2 font-medium">to</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {criteria.map((c, i) => {
              const f = c.getFieldset();
              return (
                <tr key={c.key} className="align-top">
                  <td className="pr-2 pb-2">
                    <input type="hidden" name={f.id.name} defaultValue={f.id.initialValue as string | undefined} key={f.id.key} />
                    <CellInput field={f.name} label={`Criterion ${i + 1} name`} />
                  </td>
                  <td className="pr-2 pb-2 w-24">
                    <CellInput field={f.weight} label={`Criterion ${i + 1} weight`} type="number" />
                  </td>
                  <td className="pr-2 pb-2 w-24">
                    <CellInput field={f.scaleMin} label={`Criterion ${i + 1} scale from`} type="number" />
                  </td>
                  <td className="pr-2 pb-2 w-24">
                    <CellInput field={f.scaleMax} label={`Criterion ${i + 1} scale to`} type="number" />
                  </td>
                  <td className="pb-2">
                    <button className="btn-quiet" {...form.remove.getButtonProps({ name: fields.criteria.name, index: i })} aria-label={`Remove criterion ${i + 1}`}>
                      Remove
                    </button>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        <button className="btn-quiet mt-2" {...form.insert.getButtonProps({ name: fields.criteria.name, defaultValue: { name: "", weight: "1", scaleMin: "0", scaleMax: "10" } })}>
          Add a criterion
        </button>
      </section>

      <section className="card" aria-labelledby="pins-h">
        <h2 id="pins-h" className="mb-4 text-lg font-bold">Ruleset: top module and pins</h2>
        <div className="grid gap-x-4 sm:grid-cols-2">
          <Input field={rs.topModule} label="Top module name" />
          <Select field={rs.resetActive} label="Reset is active" options={[{ value: "low", label: "low (rst_n style)" }, { value: "high", label: "high" }]} />
        </div>
        <FieldError field={rs.pins} />
        <table className="w-full text-sm" aria-label="Pin list">
          <thead>
            <tr className="text-left text-mute">
              <th className="pb-2 font-medium">Pin name</th>
              <th className="pb-2 font-medium">Direction</th>
              <th className="pb-2 font-medium">Width (bits)</th>
              <th className="pb-2 font-medium">Role</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {pins.map((p, i) => {
              const f = p.getFieldset();
              return (
                <tr key={p.key} className="align-top">
                  <td className="pr-2 pb-2">
                    <CellInput field={f.name} label={`Pin ${i + 1} name`} />
                  </td>
                  <td className="pr-2 pb-2">
                    <CellSelect field={f.direction} label={`Pin ${i + 1} direction`} options={["input", "output", "inout"]} />
                  </td>
                  <td className="pr-2 pb-2 w-28">
                    <CellInput field={f.width} label={`Pin ${i + 1} width`} type="number" />
                  </td>
                  <td className="pr-2 pb-2">
                    <CellSelect field={f.role} label={`Pin ${i + 1} role`} options={PIN_ROLES} />
                  </td>
                  <td className="pb-2">
                    <button className="btn-quiet" {...form.remove.getButtonProps({ name: rs.pins.name, index: i })} aria-label={`Remove pin ${i + 1}`}>
                      Remove
                    </button>
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        <button className="btn-quiet mt-2" {...form.insert.getButtonProps({ name: rs.pins.name, defaultValue: { name: "", direction: "output", width: "1", role: "unused" } })}>
          Add a pin
        </button>
      </section>

      <section className="card" aria-labelledby="signal-h">
        <h2 id="signal-h" className="mb-4 text-lg font-bold">Ruleset: clock, video and audio</h2>
        <div className="grid gap-x-4 sm:grid-cols-3">
          <Input field={clock.frequencyHz} label="Board clock (Hz)" type="number" hint="The oscillator on the party's board: 25000000 is usual for 640×480; 25175000 is the VESA pixel clock." />
          <Input field={clock.tolerancePct} label="Clock tolerance (%)" type="number" step="0.01" hint="The rates must stay in the monitor window at both ends." />
          <Input field={clock.clocksPerPixel} label="Clocks per pixel" type="number" hint="1, or 2 for a 50 MHz board whose designs hold each pixel two clocks." />
          <Select field={rs.videoMode} label="Video mode" options={Object.values(VIDEO_MODES).map((m) => ({ value: m.id, label: m.label }))} />
          <Input field={rs.colourBitsPerChannel} label="Colour bits per channel" type="number" />
          <fieldset className="sm:col-span-3">
            <legend className="text-sm font-semibold">Monitor window</legend>
            <p className="mb-2 text-sm text-mute">
              What the party's monitor or projector locks to. Leave all four blank for the mode's usual window (for 640×480 @ 60 Hz: lines at 31.0–32.0 kHz,
              frames at 59.0–61.0 Hz — common practice, not a published standard); try your own screen and enter its range if it is narrower.
            </p>
            <div className="grid gap-x-4 sm:grid-cols-4">
              <Input field={monitor.lineMinKHz} label="Lines from (kHz)" type="number" step="0.001" />
              <Input field={monitor.lineMaxKHz} label="Lines to (kHz)" type="number" step="0.001" />
              <Input field={monitor.refreshMinHz} label="Frames from (Hz)" type="number" step="0.001" />
              <Input field={monitor.refreshMaxHz} label="Frames to (Hz)" type="number" step="0.001" />
            </div>
          </fieldset>
          <Check field={flash.enabled} label="Run the flash check" hint="WCAG 2.2 SC 2.3.1 general and red flash thresholds." />
          <Select field={flash.action} label="When an entry flashes" options={[{ value: "warn", label: "warn (show a warning)" }, { value: "block", label: "block (fail the check)" }]} />
          <Select
            field={flash.viewing}
            label="Entries are watched"
            options={[
              { value: "hall", label: "in a hall (a flash anywhere on the screen counts)" },
              { value: "desk", label: "at a desk (WCAG's 10° field area rule applies)" },
            ]}
          />
          <Input field={audio.lowPassHz} label="Audio low-pass cut-off (Hz)" type="number" step="any" />
        </div>
      </section>

      <section className="card" aria-labelledby="tile-h">
        <h2 id="tile-h" className="mb-4 text-lg font-bold">Ruleset: tile and layout</h2>
        <div className="grid gap-x-4 sm:grid-cols-4">
          <Input field={tile.widthUm} label="Tile width (µm)" type="number" step="any" />
          <Input field={tile.heightUm} label="Tile height (µm)" type="number" step="any" />
          <Input field={tile.maxTiles} label="Most tiles per entry" type="number" />
          <Input field={tile.shapes} label="Allowed shapes" hint="name=columns x rows, e.g. single=1x1, wide=2x1, tall=1x2 (names are yours). An example ruleset for your own shuttle: /rulesets/example-own-shuttle.json" />
          <Input field={pinLayer.layer} label="Pin label layer" type="number" />
          <Input field={pinLayer.datatype} label="Pin label datatype" type="number" hint="Empty: any datatype." />
          <Input field={pinLayer.edgeToleranceUm} label="Pin edge tolerance (µm)" type="number" step="any" />
          <Input field={rs.flipFlopBudget} label="Flip-flop budget" type="number" hint="Empty: no limit." />
          <Input field={rs.flipFlopTolerancePct} label="Layout flip-flops vs synthesis (± %)" type="number" step="any" hint="Fan-out duplicates; the flow adds none." />
        </div>
        <div className="grid gap-x-4 sm:grid-cols-2">
          <Input field={rs.flipFlopPattern} label="Flip-flop cell pattern (regular expression)" />
          <TextArea field={rs.forbiddenCellPatterns} label="Forbidden cell patterns (one regular expression a line)" rows={4} />
        </div>
      </section>

      <section className="card" aria-labelledby="submit-h">
        <h2 id="submit-h" className="mb-4 text-lg font-bold">Ruleset: what crews submit</h2>
        <div className="grid gap-x-4 sm:grid-cols-2">
          <Check field={repo.allowed} label="Sources may come as a repository link and commit" hint="Fetched by the check run: one commit, shallow, in the sandbox." />
          <Check field={repo.submodules} label="Fetch the commit's submodules too" />
          <Input field={repo.transferMiB} label="Repository fetch: most data (MiB)" type="number" step="any" />
          <Input field={repo.fetchSeconds} label="Repository fetch: time limit (s)" type="number" />
          <Check field={licence.required} label="A licence (SPDX identifier) is required" />
          <Check field={licence.openOnly} label="Only open source licences (OSI-approved)" />
        </div>
      </section>

      <section className="card" aria-labelledby="limits-h">
        <h2 id="limits-h" className="mb-4 text-lg font-bold">Ruleset: upload limits and simulation</h2>
        <div className="grid gap-x-4 sm:grid-cols-4">
          <Input field={limits.bundleMiB} label="Source bundle (MiB)" type="number" step="any" />
          <Input field={limits.bundleUnpackedMiB} label="Bundle unpacked (MiB)" type="number" step="any" />
          <Input field={limits.bundleFiles} label="Files in bundle" type="number" />
          <Input field={limits.bundleDepth} label="Folder depth" type="number" />
          <Input field={limits.bundleCompressionRatio} label="Compression ratio" type="number" step="any" />
          <Input field={limits.layoutMiB} label="Layout (MiB)" type="number" step="any" />
          <Input field={limits.videoMiB} label="Capture video (MiB)" type="number" step="any" />
          <Input field={limits.stillMiB} label="Still (MiB)" type="number" step="any" />
          <Input field={sim.frames} label="Frames to simulate (empty: the whole demo)" type="number" />
          <Input field={sim.maxRunSeconds} label="Whole demo: at most (s of picture)" type="number" />
          <Input field={sim.resetCycles} label="Reset cycles" type="number" />
          <Input field={sim.compileSeconds} label="Build time limit (s)" type="number" />
          <Input field={sim.runSeconds} label="Run time limit (s)" type="number" />
          <Input field={sim.memoryMb} label="Memory limit (MB)" type="number" />
        </div>
      </section>

      <div className="flex gap-3">
        <button type="submit" className="btn-signal" disabled={busy}>
          {submitLabel}
        </button>
      </div>
    </Form>
  );
}

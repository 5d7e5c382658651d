import { useState } from "react";
import { CircuitFigure, CircuitResults } from "~/components/circuit-results";
import { BLANK_MEANS, FUSE_OPTIONS, WIRE_OPTIONS } from "~/components/planner-form";
import { circuitSummary } from "~/engine/circuit";
import { INSULATION_RATINGS_C } from "~/engine/wire";
import {
  circuitPreview,
  type DraftCallout,
  type LoadKind,
  loadKindOf,
  missingWords,
  setField,
  setOptionalText,
  setRelay,
  switchLoadKind,
} from "./callout-state";
import { type FieldErrors, fieldId } from "./field-paths";
import { CheckField, NumberField, type Option, SelectField, TextField } from "./fields";

/** `{ awg: 12 }` ↔ "awg:12", the planner's menu values. */
export function wireValue(wire: unknown): string {
  if (typeof wire !== "object" || wire === null) return "";
  const w = wire as Record<string, unknown>;
  if (typeof w.awg === "number") return `awg:${w.awg}`;
  if (typeof w.mm2 === "number") return `mm2:${w.mm2}`;
  return "";
}

export function wireFrom(value: string): { awg: number } | { mm2: number } | undefined {
  const [unit, size] = value.split(":");
  if (!size || (unit !== "awg" && unit !== "mm2")) return undefined;
  return unit === "awg" ? { awg: Number(size) } : { mm2: Number(size) };
}

/** `undefined` not chosen, `null` no fuse: the engine's three states of `fuseA`. */
export function fuseValue(fuseA: unknown): string {
  if (fuseA === null) return "none";
  return typeof fuseA === "number" ? String(fuseA) : "";
}

export function fuseFrom(value: string): number | null | undefined {
  if (value === "none") return null;
  return value === "" ? undefined : Number(value);
}

const NOT_CHOSEN: Option = { value: "", label: "Not chosen" };
const opts = (pairs: [string, string][]): Option[] => pairs.map(([value, label]) => ({ value, label }));

function fuseOptions(current: unknown): Option[] {
  const list = [NOT_CHOSEN, { value: "none", label: "No fuse" }, ...FUSE_OPTIONS];
  const value = fuseValue(current);
  return list.some((o) => o.value === value) ? list : [...list, { value, label: `${value} A (not a standard rating)` }];
}

type SwitchFeedMode = "" | "main" | "tap";

function switchFeedMode(feed: unknown): SwitchFeedMode {
  const from = typeof feed === "object" && feed !== null ? (feed as Record<string, unknown>).from : undefined;
  return from === "main" || from === "tap" ? from : "";
}

/** A new switch feed in the chosen mode, keeping the wire (and a tap's fuse) already given. */
export function switchFeedFor(mode: SwitchFeedMode, old: unknown): Record<string, unknown> | undefined {
  if (mode === "") return undefined;
  const feed = typeof old === "object" && old !== null ? (old as Record<string, unknown>) : {};
  const kept: Record<string, unknown> = { from: mode };
  if (feed.wire !== undefined) kept.wire = feed.wire;
  if (mode === "tap" && feed.fuseA !== undefined) kept.fuseA = feed.fuseA;
  return kept;
}

export function CircuitForm({
  callout,
  onChange,
  path,
  errors,
  disconnectsBattery,
}: {
  callout: DraftCallout;
  onChange: (next: DraftCallout) => void;
  path: string;
  errors: FieldErrors;
  disconnectsBattery: boolean;
}) {
  const [chosenLoadKind, setChosenLoadKind] = useState<LoadKind>("watts");
  const [notice, setNotice] = useState<string | null>(null);
  const [stashedFeed, setStashedFeed] = useState<unknown>(undefined);
  const loadKind = loadKindOf(callout, chosenLoadKind);
  const loadField = loadKind === "amps" ? "loadAmps" : "loadWatts";
  const p = (field: string) => `${path}.${field}`;
  const set = (field: string, value: unknown) => onChange(setField(callout, field, value));
  const blank = (field: keyof typeof BLANK_MEANS, value: unknown) => ({
    placeholder: BLANK_MEANS[field].placeholder,
    hint: value === undefined ? `Left blank: ${BLANK_MEANS[field].words}.` : undefined,
  });
  const common = { errors };
  const feed = callout.switchFeed as Record<string, unknown> | undefined;
  const mode = switchFeedMode(feed);
  const preview = circuitPreview(callout);

  return (
    <div className="space-y-4">
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField
          {...common}
          path={p("label")}
          label="Circuit name (optional)"
          placeholder="Driving lamps"
          value={callout.label}
          maxLength={120}
          onText={(text) => onChange(setOptionalText(callout, "label", text))}
        />
        <SelectField
          {...common}
          path={p("feed")}
          label="Fed from"
          value={callout.feed === "fuse-box" ? "fuse-box" : "battery"}
          options={opts([
            ["battery", "The battery"],
            ["fuse-box", "A fuse box tap"],
          ])}
          onSelect={(value) => set("feed", value)}
          hint={
            callout.feed !== "fuse-box" && !disconnectsBattery
              ? "Fed from the battery: mark this step, or an earlier one, “disconnects the battery” (rule battery-disconnect-missing)."
              : undefined
          }
        />
      </div>
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-3">
        <SelectField
          {...common}
          path={p("systemVoltage")}
          label="System voltage"
          value={callout.systemVoltage === 24 ? "24" : "12"}
          options={opts([
            ["12", "12 V"],
            ["24", "24 V"],
          ])}
          onSelect={(value) => set("systemVoltage", Number(value))}
        />
        <SelectField
          errors={{}}
          path={`${p("load")}.kind`}
          label="Load given in"
          value={loadKind}
          options={opts([
            ["watts", "watts (W)"],
            ["amps", "amps (A)"],
          ])}
          onSelect={(value) => {
            const to = value === "amps" ? "amps" : "watts";
            const switched = switchLoadKind(callout, to);
            setChosenLoadKind(to);
            setNotice(switched.notice);
            onChange(switched.callout);
          }}
        />
        <NumberField
          {...common}
          className="col-span-2 sm:col-span-1"
          path={p(loadField)}
          label={loadKind === "amps" ? "Load current (A)" : "Load power (W)"}
          localError={errors[p(loadField === "loadWatts" ? "loadAmps" : "loadWatts")]}
          value={callout[loadField]}
          onValue={(value) => {
            setNotice(null);
            set(loadField, value);
          }}
        />
      </div>
      {notice ? (
        <p className="-mt-2 text-sm text-spruce-800" role="status">
          {notice}
        </p>
      ) : null}
      <CheckField
        {...common}
        path={p("continuous")}
        label="Runs 3 hours or more (continuous)"
        checked={callout.continuous !== false}
        onCheck={(checked) => set("continuous", checked)}
      />
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        <NumberField
          {...common}
          path={p("oneWayLengthM")}
          label="One-way run (m)"
          hint="Measured along the route the wire takes."
          value={callout.oneWayLengthM}
          onValue={(value) => set("oneWayLengthM", value)}
        />
        <SelectField
          {...common}
          path={p("returnPath")}
          label="Return path"
          value={callout.returnPath === "chassis" ? "chassis" : "wire"}
          options={opts([
            ["wire", "Own return wire"],
            ["chassis", "Chassis ground"],
          ])}
          onSelect={(value) => set("returnPath", value)}
        />
        <SelectField
          {...common}
          path={p("location")}
          label="Wire runs in the"
          value={callout.location === "cabin" ? "cabin" : "engine-bay"}
          options={opts([
            ["engine-bay", "Engine bay"],
            ["cabin", "Cabin"],
          ])}
          onSelect={(value) => set("location", value)}
        />
        <SelectField
          {...common}
          path={p("insulationC")}
          label="Insulation rating"
          value={String(typeof callout.insulationC === "number" ? callout.insulationC : 105)}
          options={INSULATION_RATINGS_C.map((c) => ({ value: String(c), label: `${c} °C` }))}
          onSelect={(value) => set("insulationC", Number(value))}
        />
        <NumberField
          {...common}
          path={p("bundled")}
          label="Wires in the bundle"
          inputMode="numeric"
          value={callout.bundled}
          onValue={(value) => set("bundled", value)}
          {...blank("bundled", callout.bundled)}
        />
        <NumberField
          {...common}
          path={p("dropLimitPct")}
          label="Drop limit (%)"
          value={callout.dropLimitPct}
          onValue={(value) => set("dropLimitPct", value)}
          placeholder={BLANK_MEANS.dropLimitPct.placeholder}
          hint={
            callout.dropLimitPct === undefined
              ? `Left blank: ${BLANK_MEANS.dropLimitPct.words} (3 for lighting, 10 otherwise).`
              : "3 for lighting, 10 otherwise."
          }
        />
        <NumberField
          {...common}
          path={p("switchRatingA")}
          label="Switch rating (A)"
          value={callout.switchRatingA}
          onValue={(value) => set("switchRatingA", value)}
          {...blank("switchRatingA", callout.switchRatingA)}
        />
        <NumberField
          {...common}
          path={p("conductorTempC")}
          label="Wire temperature (°C)"
          value={callout.conductorTempC}
          onValue={(value) => set("conductorTempC", value)}
          {...blank("conductorTempC", callout.conductorTempC)}
        />
      </div>
      <fieldset className="min-w-0 space-y-3 border-t border-rule pt-3">
        <legend className="pr-2 text-xs font-semibold uppercase tracking-wider text-ink-soft">Your choices (checked live)</legend>
        <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
          <SelectField
            {...common}
            path={p("wire")}
            label="Wire size"
            value={wireValue(callout.wire)}
            options={[NOT_CHOSEN, ...WIRE_OPTIONS]}
            onSelect={(value) => set("wire", wireFrom(value))}
          />
          <SelectField
            {...common}
            path={p("fuseA")}
            label="Fuse"
            value={fuseValue(callout.fuseA)}
            options={fuseOptions(callout.fuseA)}
            onSelect={(value) => set("fuseA", fuseFrom(value))}
          />
          <NumberField
            {...common}
            path={p("fuseDistanceMm")}
            label="Fuse to battery (mm)"
            inputMode="numeric"
            value={callout.fuseDistanceMm}
            onValue={(value) => set("fuseDistanceMm", value)}
            {...blank("fuseDistanceMm", callout.fuseDistanceMm)}
          />
          <SelectField
            {...common}
            path={p("relay")}
            label="Relay"
            value={callout.relay === true ? "yes" : callout.relay === false ? "no" : ""}
            options={opts([
              ["", "Not decided"],
              ["yes", "Used"],
              ["no", "Not used"],
            ])}
            onSelect={(value) => {
              const relay = value === "" ? undefined : value === "yes";
              const next = setRelay(callout, relay);
              if (next.removed !== undefined) setStashedFeed(next.removed);
              else if (relay !== false && stashedFeed !== undefined && next.callout.switchFeed === undefined) {
                next.callout.switchFeed = stashedFeed;
                setStashedFeed(undefined);
              }
              onChange(next.callout);
            }}
          />
        </div>
        {callout.relay !== false || feed !== undefined ? (
          <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
            <SelectField
              {...common}
              className="col-span-2"
              path={p("switchFeed")}
              label="Switch and relay coil fed"
              value={mode}
              options={opts([
                ["", "From the main fused line, on the main wire"],
                ["main", "From the main fused line, on a wire of its own"],
                ["tap", "From a fused tap of its own"],
              ])}
              onSelect={(value) => set("switchFeed", switchFeedFor(value as SwitchFeedMode, feed))}
            />
            {mode !== "" ? (
              <SelectField
                {...common}
                path={p("switchFeed.wire")}
                label="Switch feed wire"
                value={wireValue(feed?.wire)}
                options={[{ value: "", label: mode === "main" ? "Same as the main wire" : "Not chosen" }, ...WIRE_OPTIONS]}
                onSelect={(value) => set("switchFeed", setField(feed ?? { from: mode }, "wire", wireFrom(value)))}
              />
            ) : null}
            {mode === "tap" ? (
              <NumberField
                {...common}
                path={p("switchFeed.fuseA")}
                label="Switch feed fuse (A)"
                value={feed?.fuseA}
                onValue={(value) => set("switchFeed", setField(feed ?? { from: "tap" }, "fuseA", value))}
              />
            ) : null}
          </div>
        ) : (
          <p className="text-xs text-ink-soft">No relay: the switch sits in the main line and carries the load.</p>
        )}
      </fieldset>
      <CircuitPreviewPanel callout={callout} path={path} preview={preview} />
    </div>
  );
}

function CircuitPreviewPanel({
  callout,
  path,
  preview,
}: {
  callout: DraftCallout;
  path: string;
  preview: ReturnType<typeof circuitPreview>;
}) {
  if (!preview.ok) {
    return (
      <section
        aria-label="Circuit results"
        aria-live="polite"
        className="rounded-md border-2 border-dashed border-rule p-4 text-sm text-ink-soft"
        data-testid="circuit-waiting"
      >
        {preview.missing.length ? <p className="font-medium text-ink">{missingWords(preview.missing)}</p> : null}
        {preview.problems.length ? (
          <>
            <p className={preview.missing.length ? "mt-2" : "font-medium text-ink"}>
              {preview.missing.length ? "Also to put right:" : "Put these right to see the results:"}
            </p>
            <ul className="mt-1 list-disc pl-5">
              {preview.problems.map((message) => (
                <li key={message}>{message}</li>
              ))}
            </ul>
          </>
        ) : null}
      </section>
    );
  }
  const relay = typeof callout.relay === "boolean" ? callout.relay : undefined;
  return (
    <section aria-label="Circuit results" className="rounded-md bg-paper p-3">
      <p className="text-xs font-semibold uppercase tracking-wider text-ink-soft">Results, as readers will see them</p>
      {/* The whole panel changes on every keystroke: only its one-line verdict is announced. */}
      <p className="sr-only" role="status">
        {circuitSummary(preview.result).text}
      </p>
      <CircuitResults result={preview.result} relay={relay} />
      <CircuitFigure
        input={{ ...preview.result.inputs, relay, label: preview.input.label }}
        result={preview.result}
        id={`${fieldId(path)}-diagram`}
      />
    </section>
  );
}

import { formatNumber } from "@/components/charts/format";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { Caution } from "@/components/caution";
import { ScrollArea } from "@/components/ui/scroll-area";
import { getAirframe } from "@/db/access/curve-lab/airframes";
import { snapshotOf } from "@/lib/curve-lab/demo-spec";
import { CONFIGURATION_KEYS, CONFIGURATION_LABELS } from "@/lib/curve-lab/demo-spec";
import { caseFigures, flaggedLiftToDrag, flaggedSpeed, stallByConfiguration, AXIS_ASSUMPTION } from "@/lib/curve-lab/readouts";
import { ftToM, kgToLb, lbToKg, mToFt, aspectRatio } from "@/lib/aero";
import { AirframeButtons } from "../_components/airframe-actions";

export const metadata: Metadata = { title: "Airframe · Curve Lab" };
export const dynamic = "force-dynamic";

const fmt = formatNumber;

const query = z.object({
  massLb: z.coerce.number({ error: "Mass must be a number" }).positive("Mass must be above 0 lb").optional(),
  altitudeFt: z.coerce
    .number({ error: "Altitude must be a number" })
    .min(-2000, "Altitude must be between -2,000 and 40,000 ft")
    .max(40000, "Altitude must be between -2,000 and 40,000 ft")
    .optional(),
});

export default async function AirframePage({
  params,
  searchParams,
}: {
  params: Promise<{ airframeId: string }>;
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const { airframeId } = await params;
  const user = await requirePagePermission("airframes.view", `/curve-lab/airframes/${airframeId}`);
  const a = z.string().uuid().safeParse(airframeId).success ? await getAirframe(user.schoolId, airframeId) : null;
  if (!a) notFound();
  const sp = await searchParams;
  const parsed = query.safeParse({ massLb: sp.massLb || undefined, altitudeFt: sp.altitudeFt || undefined });
  const fieldErrors: Record<string, string> = {};
  let massKg = a.maxMassKg;
  let altitudeM = 0;
  if (parsed.success) {
    if (parsed.data.massLb !== undefined) {
      const kg = lbToKg(parsed.data.massLb);
      if (kg < a.emptyMassKg - 0.5 || kg > a.maxMassKg + 0.5)
        fieldErrors.massLb = `Mass must be between ${fmt(kgToLb(a.emptyMassKg))} and ${fmt(kgToLb(a.maxMassKg))} lb for this profile`;
      else massKg = kg;
    }
    if (parsed.data.altitudeFt !== undefined) altitudeM = ftToM(parsed.data.altitudeFt);
  } else {
    for (const i of parsed.error.issues) fieldErrors[String(i.path[0])] = i.message;
  }
  const snap = snapshotOf(a);
  const c = { label: "", massKg, altitudeM, isaDeviationK: 0, configuration: "clean" as const };
  const eas = caseFigures(snap, c, "equivalent");
  const tas = caseFigures(snap, c, "true");
  const stalls = stallByConfiguration(snap, c, "equivalent");
  const stallsTas = stallByConfiguration(snap, c, "true");
  const editable = can(user, "airframes.edit");
  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-caption">
        <Link href="/curve-lab">Curve Lab</Link> / <Link href="/curve-lab/airframes">Airframes</Link> / {a.name}
      </nav>
      <h1 className="text-display">
        {a.name}
        {a.retiredAt && <span className="ml-3 text-lead text-ink-soft">(retired)</span>}
      </h1>
      <Caution />
      {editable && <AirframeButtons airframeId={a.id} retired={a.retiredAt !== null} />}
      <div className="grid gap-4 lg:grid-cols-2">
        <section className="card space-y-2" aria-labelledby="numbers-h">
          <h2 id="numbers-h">Numbers</h2>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 num">
            <dt>Mass</dt>
            <dd>
              {fmt(kgToLb(a.emptyMassKg))}–{fmt(kgToLb(a.maxMassKg))} lb ({fmt(a.emptyMassKg)}–{fmt(a.maxMassKg)} kg)
            </dd>
            <dt>Wing</dt>
            <dd>
              {fmt(a.wingAreaM2, 2)} m², span {fmt(a.wingSpanM, 2)} m, aspect ratio {fmt(aspectRatio(a.wingSpanM, a.wingAreaM2), 2)}
            </dd>
            <dt>Oswald e</dt>
            <dd>{fmt(a.oswaldEfficiency, 2)}</dd>
            <dt>CD0 clean</dt>
            <dd>{fmt(a.zeroLiftDragCoefficient, 4)}</dd>
          </dl>
          <ScrollArea label="Configurations, scrolls sideways">
            <table className="data-table">
              <thead>
                <tr>
                  <th scope="col">Configuration</th>
                  <th scope="col">CD0 increment</th>
                  <th scope="col">CLmax</th>
                </tr>
              </thead>
              <tbody>
                {CONFIGURATION_KEYS.map((k) => {
                  const v = a.configurations[k];
                  return (
                    <tr key={k}>
                      <td>{CONFIGURATION_LABELS[k]}</td>
                      <td className="num">{v ? fmt(v.cd0Increment, 4) : "—"}</td>
                      <td className="num">{v ? fmt(v.maxLiftCoefficient, 2) : "not on this type"}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </ScrollArea>
          {a.notes && <p className="whitespace-pre-wrap text-ink-soft">{a.notes}</p>}
        </section>
        <section className="card space-y-3" aria-labelledby="derived-h">
          <h2 id="derived-h">Derived figures</h2>
          <form method="get" className="flex flex-wrap items-end gap-3" noValidate>
            <div>
              <label htmlFor="massLb" className="field-label">
                Mass (lb)
              </label>
              <input
                id="massLb"
                name="massLb"
                type="number"
                step="any"
                className="field-input num w-36"
                defaultValue={sp.massLb ?? Math.round(kgToLb(massKg))}
                aria-describedby={fieldErrors.massLb ? "massLb-error" : undefined}
              />
              {fieldErrors.massLb && (
                <p id="massLb-error" className="field-error">
                  {fieldErrors.massLb}
                </p>
              )}
            </div>
            <div>
              <label htmlFor="altitudeFt" className="field-label">
                Pressure altitude (ft)
              </label>
              <input
                id="altitudeFt"
                name="altitudeFt"
                type="number"
                step="any"
                className="field-input num w-36"
                defaultValue={sp.altitudeFt ?? Math.round(mToFt(altitudeM))}
                aria-describedby={fieldErrors.altitudeFt ? "altitudeFt-error" : undefined}
              />
              {fieldErrors.altitudeFt && (
                <p id="altitudeFt-error" className="field-error">
                  {fieldErrors.altitudeFt}
                </p>
              )}
            </div>
            <button type="submit" className="btn-quiet">
              Show
            </button>
          </form>
          <p className="text-caption text-ink-soft">
            At {fmt(kgToLb(massKg))} lb ({fmt(massKg)} kg), {fmt(mToFt(altitudeM))} ft, ISA, clean. {AXIS_ASSUMPTION}
          </p>
          <ScrollArea label="Derived figures, scrolls sideways">
            <table className="data-table" data-testid="derived-figures">
              <thead>
                <tr>
                  <th scope="col">Figure</th>
                  <th scope="col">IAS/EAS</th>
                  <th scope="col">TAS</th>
                </tr>
              </thead>
              <tbody>
                {/* each speed carries lib/aero's validity words beside it (below the stall, above Mach 0.3), as the demo readouts do */}
                <tr>
                  <td>Vmd</td>
                  <td className="num">{flaggedSpeed(eas.vmdMs, "kt", eas.flags.vmd)}</td>
                  <td className="num">{flaggedSpeed(tas.vmdMs, "kt", tas.flags.vmd)}</td>
                </tr>
                <tr>
                  <td>Vmp</td>
                  <td className="num">{flaggedSpeed(eas.vmpMs, "kt", eas.flags.vmp)}</td>
                  <td className="num">{flaggedSpeed(tas.vmpMs, "kt", tas.flags.vmp)}</td>
                </tr>
                <tr>
                  <td>Best glide</td>
                  <td className="num">{flaggedSpeed(eas.bestGlideMs, "kt", eas.flags.bestGlide)}</td>
                  <td className="num">{flaggedSpeed(tas.bestGlideMs, "kt", tas.flags.bestGlide)}</td>
                </tr>
                {stalls.map((s) => {
                  const t = stallsTas.find((x) => x.configuration === s.configuration)!;
                  return (
                    <tr key={s.configuration}>
                      <td>Stall speed, {s.label.toLowerCase()}</td>
                      <td className="num">{flaggedSpeed(s.ms, "kt", s.flag)}</td>
                      <td className="num">{flaggedSpeed(t.ms, "kt", t.flag)}</td>
                    </tr>
                  );
                })}
                <tr>
                  <td>(L/D)max (= best glide ratio)</td>
                  <td className="num" colSpan={2}>
                    {flaggedLiftToDrag(eas)}
                  </td>
                </tr>
              </tbody>
            </table>
          </ScrollArea>
        </section>
      </div>
    </div>
  );
}

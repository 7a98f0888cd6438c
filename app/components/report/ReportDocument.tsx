// The service report, one component for the page, the print view and the e-mail (rendered to
// static HTML on the server). Styled by REPORT_CSS so it reads the same in a mail client.
import { atShop, placeName } from "~/lib/display";
import { HAZARD_WORD, reportNumber, VERDICT_WORD, type ReportData } from "~/lib/report-data";
import { CONFIRMED_NOTE } from "~/lib/run-log";

export const REPORT_CSS = `
.rp { font-family: "Source Sans 3", Arial, Helvetica, sans-serif; color: #1c232e; line-height: 1.45; max-width: 52rem; margin: 0 auto; background: #fff; padding: 1.5rem; font-size: 16px; }
.rp h1 { font-size: 1.6rem; font-weight: 700; margin: 0; }
.rp h2 { font-size: 1.15rem; font-weight: 700; margin: 1.4rem 0 0.5rem; border-bottom: 2px solid #9c4521; padding-bottom: 0.2rem; }
.rp p { margin: 0.2rem 0; }
.rp .rp-head { display: flex; justify-content: space-between; gap: 1rem; flex-wrap: wrap; border-bottom: 1px solid #d9d4c8; padding-bottom: 0.8rem; }
.rp .rp-shop { font-weight: 700; color: #7a3518; }
.rp .rp-muted { color: #4a5361; }
.rp dl { display: grid; grid-template-columns: 10rem 1fr; gap: 0.2rem 1rem; margin: 0; }
.rp dt { color: #4a5361; }
.rp dd { margin: 0; }
.rp table { width: 100%; border-collapse: collapse; font-size: 0.95rem; }
.rp th, .rp td { text-align: left; border-bottom: 1px solid #d9d4c8; padding: 0.35rem 0.4rem; vertical-align: top; }
.rp th { background: #f6f4ef; }
.rp .v-within { color: #1e6b40; font-weight: 700; }
.rp .v-low, .rp .v-high { color: #a11d2f; font-weight: 700; }
.rp .v-marginal { color: #7f5400; font-weight: 700; }
.rp .rp-cause { font-size: 1.15rem; font-weight: 700; }
.rp .rp-photos { display: flex; flex-wrap: wrap; gap: 0.75rem; }
.rp .rp-photos figure { margin: 0; width: 15rem; }
.rp .rp-photos img { width: 100%; height: auto; border: 1px solid #d9d4c8; border-radius: 4px; }
.rp .rp-photos figcaption { font-size: 0.85rem; color: #4a5361; }
.rp ul { margin: 0; padding-left: 1.2rem; list-style: disc; }
.rp li { margin: 0.15rem 0; }
.rp .rp-foot { margin-top: 1.5rem; border-top: 1px solid #d9d4c8; padding-top: 0.6rem; font-size: 0.85rem; color: #4a5361; }
@media screen and (max-width: 640px) {
  .rp { padding: 1rem; }
  .rp dl { grid-template-columns: 6.5rem 1fr; }
  .rp table { font-size: 0.85rem; }
  .rp th, .rp td { padding: 0.3rem 0.25rem; }
}
@media print {
  .rp { padding: 0; max-width: none; font-size: 11pt; }
  .rp h2 { break-after: avoid; }
  .rp tr, .rp figure { break-inside: avoid; }
  .rp .rp-photos figure { width: 7cm; }
}
`;

export function ReportDocument({ report: r, photoSrc }: { report: ReportData; photoSrc: (id: string) => string }) {
  const tz = r.shop.timeZone;
  return (
    <article className="rp">
      <header className="rp-head">
        <div>
          <p className="rp-shop">
            {r.shop.name} · {r.shop.town}
          </p>
          <h1>Service report {reportNumber(r.number)}</h1>
          <p className="rp-muted">
            {r.call ? `Call ${r.call.number} · ` : ""}
            Work finished {atShop(r.completedAt, tz)}
          </p>
        </div>
        <div className="rp-muted">
          <p>
            Technician: <strong>{r.technician}</strong>
          </p>
          {r.minutesOnJob !== null && <p>Time on the job: {r.minutesOnJob} min</p>}
        </div>
      </header>

      <h2>Equipment and site</h2>
      <dl>
        {r.customer && (
          <>
            <dt>Customer</dt>
            <dd>{r.customer}</dd>
          </>
        )}
        {r.site && (
          <>
            <dt>Site</dt>
            <dd>
              {placeName(r.customer ?? "", r.site.name)}, {r.site.address}
            </dd>
            <dt>Site contact</dt>
            <dd>
              {r.site.contactName} ({r.site.contactEmail})
            </dd>
          </>
        )}
        {r.unit && (
          <>
            <dt>Unit</dt>
            <dd>
              {r.unit.make} {r.unit.model}
            </dd>
            <dt>Serial</dt>
            <dd>{r.unit.serial}</dd>
            <dt>Installed</dt>
            <dd>{r.unit.installedOn ?? "not recorded"}</dd>
          </>
        )}
        {r.call && (
          <>
            <dt>Reported</dt>
            <dd>
              “{r.call.symptom}” (call opened {atShop(r.call.openedAt, tz)})
            </dd>
          </>
        )}
        <dt>Procedure</dt>
        <dd>
          {r.procedure.title}
          {r.procedure.version !== null ? `, version ${r.procedure.version}` : ""}
        </dd>
      </dl>

      <h2>What we found</h2>
      <p className="rp-cause">{r.rootCause ?? "No root cause recorded."}</p>
      {r.remedy && <p className="rp-muted">Usual remedy: {r.remedy}</p>}

      <h2>What we did</h2>
      <p>{r.actionTaken ?? "—"}</p>

      <h2>Parts used</h2>
      {r.parts.length === 0 ? (
        <p>No parts were used.</p>
      ) : (
        <table>
          <thead>
            <tr>
              <th>Part number</th>
              <th>Description</th>
              <th>Qty</th>
            </tr>
          </thead>
          <tbody>
            {r.parts.map((p, i) => (
              <tr key={i}>
                <td>{p.partNumber || "—"}</td>
                <td>{p.description}</td>
                <td>{p.quantity}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}

      <h2>Readings</h2>
      {r.readings.length === 0 ? (
        <p>No readings were taken.</p>
      ) : (
        <table>
          <thead>
            <tr>
              <th>Check</th>
              <th>Reading</th>
              <th>Verdict</th>
              <th>Limits</th>
              <th>Meter accuracy</th>
            </tr>
          </thead>
          <tbody>
            {r.readings.map((x) => (
              <tr key={x.seq}>
                <td>{x.title}</td>
                <td>
                  {x.reading}
                  {x.confirmed ? <span className="rp-muted"> {CONFIRMED_NOTE}</span> : null}
                </td>
                <td className={x.verdict ? `v-${x.verdict}` : undefined}>{x.verdict ? VERDICT_WORD[x.verdict] : "—"}</td>
                <td>
                  {x.limits ?? "—"}
                  {x.derivation && x.derivation !== x.limits ? <span className="rp-muted"> ({x.derivation})</span> : null}
                </td>
                <td>{x.meter ?? "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {r.nameplate.length > 0 && (
        <>
          <p className="rp-muted" style={{ marginTop: "0.6rem" }}>
            Ratings read from the equipment:
          </p>
          <ul>
            {r.nameplate.map((n, i) => (
              <li key={i}>
                {n.title}: {n.value}
              </li>
            ))}
          </ul>
        </>
      )}

      {r.checks.length > 0 && (
        <>
          <h2>Checks</h2>
          <ul>
            {r.checks.map((c, i) => (
              <li key={i}>
                {c.title} — <strong>{c.answer}</strong>
              </li>
            ))}
          </ul>
        </>
      )}

      <h2>Safety precautions taken</h2>
      {r.cautions.length === 0 ? (
        <p>None were called for by the procedure.</p>
      ) : (
        <ul>
          {r.cautions.map((c, i) => (
            <li key={i}>
              {c.hazard ? `${HAZARD_WORD[c.hazard] ?? c.hazard}: ` : ""}
              {c.title}
            </li>
          ))}
        </ul>
      )}

      {r.notes.length > 0 && (
        <>
          <h2>Technician's notes</h2>
          <ul>
            {r.notes.map((n, i) => (
              <li key={i}>
                <span className="rp-muted">{n.step}:</span> {n.text}
              </li>
            ))}
          </ul>
        </>
      )}

      {r.photos.length > 0 && (
        <>
          <h2>Photos</h2>
          <div className="rp-photos">
            {r.photos.map((p) => (
              <figure key={p.id}>
                <img src={photoSrc(p.id)} alt={`Photo at: ${p.step}`} />
                <figcaption>{p.step}</figcaption>
              </figure>
            ))}
          </div>
        </>
      )}

      <p className="rp-foot">
        {r.shop.footer ?? `${r.shop.name}, ${r.shop.town}.`} Readings were judged against the procedure's limits at the time of the visit,
        with the meter accuracy shown. Gas and line-voltage work is for qualified technicians; local codes and the equipment maker's
        instructions govern.
      </p>
    </article>
  );
}

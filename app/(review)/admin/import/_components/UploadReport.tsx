// The validation report of an upload: errors and warnings apart, each row naming file, row,
// column, value and reason — what a user needs to fix the file in one pass.
export interface UploadProblem {
  severity: "error" | "warning";
  file: string;
  row?: number;
  column?: string;
  value?: string;
  reason: string;
}

function ProblemTable({ problems, kind }: { problems: UploadProblem[]; kind: "error" | "warning" }) {
  return (
    <table className="data" data-testid={`${kind}s-table`}>
      <thead>
        <tr>
          <th>File</th>
          <th className="num">Row</th>
          <th>Column</th>
          <th>Value</th>
          <th>Reason</th>
        </tr>
      </thead>
      <tbody>
        {problems.map((p, i) => (
          <tr key={i}>
            <td className="nowrap">{p.file}</td>
            <td className="num">{p.row ?? "—"}</td>
            <td>{p.column ?? "—"}</td>
            <td className="wrap">{p.value ?? ""}</td>
            <td className="wrap">{p.reason}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

export function UploadReport({ errors, warnings }: { errors: UploadProblem[]; warnings: UploadProblem[] }) {
  return (
    <div data-testid="upload-report">
      <h3>
        Errors <span className={errors.length ? "badge bad" : "badge good"}>{errors.length}</span>
      </h3>
      {errors.length > 0 ? <ProblemTable problems={errors} kind="error" /> : <p className="muted">No errors.</p>}
      <h3>
        Warnings <span className={warnings.length ? "badge warn" : "badge good"}>{warnings.length}</span>
      </h3>
      {warnings.length > 0 ? <ProblemTable problems={warnings} kind="warning" /> : <p className="muted">No warnings.</p>}
    </div>
  );
}

"use client";
import { formatCount } from "@/lib/format/numbers";
import type { CsvRowError } from "@/lib/temperatures/csv/rows";

/** Every problem of a logger file by line and column (the first 500 listed, all counted). */
export function IssueList({ issues, issueCount, issueLineCount }: { issues: CsvRowError[]; issueCount: number; issueLineCount: number }) {
  const listed = issues.length < issueCount ? ` The first ${formatCount(issues.length)} are listed.` : "";
  return (
    <div className="-mx-4 overflow-x-auto">
      <table className="w-full min-w-[640px] text-sm">
        <caption className="px-4 pb-2 text-left text-sm font-medium text-sev-critical">
          <span aria-hidden="true">⚠ </span>
          {issueCount === 1 ? "1 problem" : `${formatCount(issueCount)} problems`} on {issueLineCount === 1 ? "1 row" : `${formatCount(issueLineCount)} rows`}: nothing can be imported until they are fixed.
          {listed} Line numbers count every line of the file, the header and any lines above it included.
        </caption>
        <thead>
          <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
            <th scope="col" className="px-4 py-2 font-medium">Line</th>
            <th scope="col" className="px-4 py-2 font-medium">Column</th>
            <th scope="col" className="px-4 py-2 font-medium">Value in the file</th>
            <th scope="col" className="px-4 py-2 font-medium">Problem</th>
          </tr>
        </thead>
        <tbody>
          {issues.map((issue, index) => (
            <tr key={index} className="border-b border-ink-100 align-top last:border-0">
              <th scope="row" className="tabular px-4 py-2 text-left font-mono font-normal">{issue.line}</th>
              <td className="px-4 py-2 font-mono text-xs">{issue.column}</td>
              <td className="max-w-48 truncate px-4 py-2 font-mono text-xs" title={issue.value}>
                {issue.value === "" ? <span className="text-ink-500">(empty)</span> : issue.value}
              </td>
              <td className="px-4 py-2">{issue.message}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

"use client";

import { ChevronLeft, ChevronRight, ChevronsLeft, ChevronsRight, type LucideIcon } from "lucide-react";
import { useId } from "react";
import { formatCount } from "@/lib/format/numbers";
import { controlClass } from "./search-box";

function PageButton({ label, icon: Icon, disabled, onClick }: { label: string; icon: LucideIcon; disabled: boolean; onClick: () => void }) {
  return (
    <button
      type="button"
      aria-label={label}
      title={label}
      disabled={disabled}
      onClick={onClick}
      className="inline-flex size-9 items-center justify-center rounded-md border border-ink-300 bg-white text-ink-700 hover:bg-ink-100 disabled:cursor-not-allowed disabled:border-ink-200 disabled:text-ink-300 disabled:hover:bg-white"
    >
      <Icon aria-hidden="true" className="size-4" />
    </button>
  );
}

export function DataTablePagination({
  page,
  pageCount,
  pageSize,
  pageSizes,
  onPage,
  onPageSize,
}: {
  page: number;
  pageCount: number;
  pageSize: number;
  pageSizes: readonly number[];
  onPage: (page: number) => void;
  onPageSize: (pageSize: number) => void;
}) {
  const sizeId = useId();
  const atStart = page <= 1;
  const atEnd = page >= pageCount;
  return (
    <nav aria-label="Pages" className="flex flex-wrap items-center justify-between gap-3 border-t border-ink-200 px-3 py-2.5 text-sm text-ink-700">
      <div className="flex items-center gap-2">
        <label htmlFor={sizeId} className="text-ink-600">
          Rows per page
        </label>
        <select id={sizeId} value={pageSize} onChange={(event) => onPageSize(Number(event.target.value))} className={`${controlClass} tabular pr-8`}>
          {pageSizes.map((size) => (
            <option key={size} value={size}>
              {size}
            </option>
          ))}
        </select>
      </div>
      <div className="flex items-center gap-1.5">
        <PageButton label="First page" icon={ChevronsLeft} disabled={atStart} onClick={() => onPage(1)} />
        <PageButton label="Previous page" icon={ChevronLeft} disabled={atStart} onClick={() => onPage(page - 1)} />
        <span className="tabular min-w-28 px-2 text-center">
          Page {formatCount(Math.min(page, pageCount))} of {formatCount(pageCount)}
        </span>
        <PageButton label="Next page" icon={ChevronRight} disabled={atEnd} onClick={() => onPage(page + 1)} />
        <PageButton label="Last page" icon={ChevronsRight} disabled={atEnd} onClick={() => onPage(pageCount)} />
      </div>
    </nav>
  );
}

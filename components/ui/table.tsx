import type { ComponentProps } from "react";
import { ArrowDown, ArrowUp, ArrowUpDown } from "lucide-react";
import { cn } from "./cn";

export type TableProps = ComponentProps<"table"> & {
  /** Wrapper classes (the wrapper scrolls horizontally on narrow screens). */
  wrapperClassName?: string;
  dense?: boolean;
};

export function Table({ className, wrapperClassName, dense = false, ...rest }: TableProps) {
  return (
    // relative: the frame is the containing block of absolutely placed text in cells (screen-reader-only
    // labels), which would otherwise sit outside the scrolling frame and widen the page on a phone
    <div className={cn("relative w-full overflow-x-auto rounded-card border border-rule bg-surface", wrapperClassName)}>
      <table data-dense={dense || undefined} className={cn("group/table w-full border-collapse text-sm", className)} {...rest} />
    </div>
  );
}

export function TableCaption({ className, ...rest }: ComponentProps<"caption">) {
  return <caption className={cn("px-3 py-2 text-left text-sm text-muted", className)} {...rest} />;
}

export function THead({ className, ...rest }: ComponentProps<"thead">) {
  return <thead className={cn("bg-sunken/70", className)} {...rest} />;
}

export function TBody({ className, ...rest }: ComponentProps<"tbody">) {
  return <tbody className={cn("[&>tr:last-child]:border-b-0", className)} {...rest} />;
}

export function Tr({ className, ...rest }: ComponentProps<"tr">) {
  return <tr className={cn("border-b border-rule hover:bg-sunken/40 aria-selected:bg-sea/10", className)} {...rest} />;
}

export type SortDirection = "ascending" | "descending" | "none";

export type ThProps = ComponentProps<"th"> & {
  /** Right-aligned, for columns of figures. */
  numeric?: boolean;
  /** When set, the header renders a sort button and aria-sort. */
  sort?: SortDirection;
  onSort?: () => void;
};

export function Th({ className, numeric = false, sort, onSort, children, scope = "col", ...rest }: ThProps) {
  const align = numeric ? "text-right" : "text-left";
  const cellClass = cn(
    "px-3 py-2 text-xs font-semibold tracking-wide text-muted uppercase group-data-dense/table:py-1.5",
    align,
    className,
  );
  if (!onSort) {
    return (
      <th scope={scope} className={cellClass} {...rest}>
        {children}
      </th>
    );
  }
  const Icon = sort === "ascending" ? ArrowUp : sort === "descending" ? ArrowDown : ArrowUpDown;
  return (
    <th scope={scope} aria-sort={sort ?? "none"} className={cellClass} {...rest}>
      <button
        type="button"
        onClick={onSort}
        className={cn(
          "inline-flex items-center gap-1 rounded-sm uppercase hover:text-ink focus-visible:outline-2 focus-visible:outline-focus",
          numeric && "flex-row-reverse",
        )}
      >
        {children}
        <Icon aria-hidden="true" className={cn("h-3.5 w-3.5", sort === "none" || !sort ? "opacity-50" : "")} />
      </button>
    </th>
  );
}

export type TdProps = ComponentProps<"td"> & { numeric?: boolean };

export function Td({ className, numeric = false, ...rest }: TdProps) {
  return (
    <td
      className={cn("px-3 py-2 align-middle text-ink group-data-dense/table:py-1", numeric && "figures text-right whitespace-nowrap", className)}
      {...rest}
    />
  );
}

import { createContext, use, type ComponentProps, type ReactNode } from "react";

/**
 * Below the `stackBelow` width each row becomes a card and every cell shows its column name
 * before the value (from `label`), so nothing needs side-scrolling; cards sit two abreast on a
 * tablet. Wide tables (many columns, several buttons) stack up to `lg`.
 */
type StackBelow = "md" | "lg";

// Spelled out per breakpoint: Tailwind finds only class names written whole in the source.
const CLASSES: Record<StackBelow, { table: string; head: string; body: string; row: string; cell: string }> = {
  md: {
    table: "max-md:block",
    head: "max-md:sr-only",
    body: "max-md:grid max-md:gap-3",
    row: "max-md:flex max-md:flex-col max-md:rounded-xl max-md:border-2 max-md:bg-surface max-md:p-3",
    cell: "max-md:flex max-md:items-baseline max-md:gap-3 max-md:px-0 max-md:py-1 max-md:before:w-28 max-md:before:shrink-0 max-md:before:text-base max-md:before:font-semibold max-md:before:text-muted max-md:before:content-[attr(data-label)]",
  },
  lg: {
    table: "max-lg:block",
    head: "max-lg:sr-only",
    body: "max-lg:grid max-lg:gap-3 md:max-lg:grid-cols-2",
    row: "max-lg:flex max-lg:flex-col max-lg:rounded-xl max-lg:border-2 max-lg:bg-surface max-lg:p-3",
    cell: "max-lg:flex max-lg:items-baseline max-lg:gap-3 max-lg:px-0 max-lg:py-1 max-lg:before:w-24 max-lg:before:shrink-0 max-lg:before:text-base max-lg:before:font-semibold max-lg:before:text-muted max-lg:before:content-[attr(data-label)]",
  },
};

const StackContext = createContext<StackBelow>("md");

export function Table({ caption, stackBelow = "md", children }: { caption: string; stackBelow?: StackBelow; children: ReactNode }) {
  return (
    <StackContext value={stackBelow}>
      <table className={`w-full border-collapse text-lg ${CLASSES[stackBelow].table}`}>
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </StackContext>
  );
}

export function TableHead({ children }: { children: ReactNode }) {
  const stack = use(StackContext);
  return (
    <thead className={CLASSES[stack].head}>
      <tr className="border-b-2 border-line text-left text-base text-muted">{children}</tr>
    </thead>
  );
}

export function Th({ children, className = "" }: { children?: ReactNode; className?: string }) {
  return (
    <th scope="col" className={`px-3 py-2 font-semibold ${className}`}>
      {children}
    </th>
  );
}

export function TableBody({ children }: { children: ReactNode }) {
  const stack = use(StackContext);
  return <tbody className={CLASSES[stack].body}>{children}</tbody>;
}

export function Tr({ className = "", ...props }: ComponentProps<"tr">) {
  const stack = use(StackContext);
  return <tr {...props} className={`border-b border-line align-middle ${CLASSES[stack].row} ${className}`} />;
}

type TdProps = ComponentProps<"td"> & { label: string };

export function Td({ label, className = "", ...props }: TdProps) {
  const stack = use(StackContext);
  return <td {...props} data-label={label} className={`px-3 py-3 ${CLASSES[stack].cell} ${className}`} />;
}

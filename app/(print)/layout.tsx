// Pages made to be printed (the PDF impact report): no navigation bar, a page-width column, print CSS.
import "./print.css";

export const dynamic = "force-dynamic";

export default function PrintLayout({ children }: { children: React.ReactNode }) {
  return <div className="print-page">{children}</div>;
}

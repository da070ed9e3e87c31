import type { Metadata } from "next";
import "./globals.css";

export const metadata: Metadata = {
  title: "Beamgate",
  description: "Predict, review and record antenna parameter changes before they reach the network.",
};

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <body>{children}</body>
    </html>
  );
}

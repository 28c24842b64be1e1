import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { connection } from "next/server";
import { Toaster } from "sonner";
import "./globals.css";

const sans = localFont({
  src: "../fonts/source-sans-3-latin-wght-normal.woff2",
  variable: "--font-sans",
  weight: "200 900",
  style: "normal",
  display: "swap",
});

export const metadata: Metadata = {
  title: { default: "Tributary", template: "%s · Tributary" },
  description:
    "The intake desk between data providers and analysts: batches checked against a study's data plan.",
};

export const viewport: Viewport = {
  themeColor: [
    { media: "(prefers-color-scheme: light)", color: "#12262E" },
    { media: "(prefers-color-scheme: dark)", color: "#0E1B20" },
  ],
  colorScheme: "light dark",
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // every page is rendered per request: its scripts carry that request's CSP nonce (proxy.ts);
  // a page prerendered at build time would have none and its scripts would be refused
  await connection();
  return (
    <html lang="en-GB" className={sans.variable}>
      <body>
        {children}
        <Toaster
          position="bottom-right"
          closeButton
          toastOptions={{
            classNames: {
              toast: "!font-sans !text-base !border-silt-line !bg-white !text-ink",
              error: "!border-clay/50",
              success: "!border-reed/50",
            },
          }}
        />
      </body>
    </html>
  );
}

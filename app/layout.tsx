import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { Providers } from "./providers";
import "./globals.css";

// Fonts ship with the app (SIL Open Font License; see app/fonts/LICENSE-*.txt): no network.
const body = localFont({
  src: "./fonts/inter-latin-wght.woff2",
  variable: "--font-body",
  display: "swap",
  weight: "100 900",
});
const code = localFont({
  src: "./fonts/jetbrains-mono-latin-wght.woff2",
  variable: "--font-code",
  display: "swap",
  weight: "100 800",
});

export const metadata: Metadata = {
  title: { default: "Recurra", template: "%s · Recurra" },
  description: "Which failures keep coming back, on which vehicles, at what mileage.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1 };

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en-GB" className={`${body.variable} ${code.variable}`}>
      <body>
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}

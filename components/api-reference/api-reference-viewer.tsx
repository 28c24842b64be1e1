"use client";
/**
 * The API reference, drawn in the browser by Scalar's viewer from the document the API serves
 * at /api/v1/openapi.json. Everything that would reach outside this server is switched off:
 * Scalar's own web fonts (the page uses the product's font), its telemetry, its request client
 * and developer toolbar, its agent. Colours come from the product's palette variables
 * (app/globals.css), so the viewer follows the light and dark scheme with the rest of the app.
 */
import dynamic from "next/dynamic";
import "@scalar/api-reference-react/style.css";
import "./api-reference-theme.css";

// the viewer mounts a Vue app into a div once in the browser; nothing of it renders on the server
const ApiReferenceReact = dynamic(
  () => import("@scalar/api-reference-react").then((m) => m.ApiReferenceReact),
  {
    ssr: false,
    loading: () => <p className="py-8 text-silt-ink">Loading the reference…</p>,
  },
);

const configuration = {
  url: "/api/v1/openapi.json",
  theme: "none" as const,
  layout: "modern" as const,
  withDefaultFonts: false,
  telemetry: false,
  hideClientButton: true,
  hideTestRequestButton: true,
  hideDarkModeToggle: true,
  showDeveloperTools: "never" as const,
  agent: { disabled: true },
  documentDownloadType: "json" as const,
  defaultOpenAllTags: true,
};

export function ApiReferenceViewer() {
  return (
    <div className="tributary-api-reference">
      <ApiReferenceReact configuration={configuration} />
    </div>
  );
}

/** Class names for buttons and button-like links, so forms and links look alike. */
export const buttonClass = {
  primary:
    "inline-flex items-center justify-center gap-2 rounded-md bg-sea-700 px-4 py-2 font-medium text-white no-underline hover:bg-sea-800 hover:no-underline disabled:cursor-not-allowed disabled:opacity-50",
  secondary:
    "inline-flex items-center justify-center gap-2 rounded-md border border-line-strong bg-panel px-4 py-2 font-medium text-ink no-underline hover:bg-sea-50 hover:no-underline disabled:cursor-not-allowed disabled:opacity-50",
  quiet:
    "inline-flex items-center gap-1 rounded-md px-2 py-1 text-sm text-ink-soft hover:bg-sea-50 hover:text-ink",
} as const;

export const inputClass =
  "w-full rounded-md border border-line-strong bg-white px-3 py-2 text-ink placeholder:text-ink-soft/70 focus:border-sea-600";

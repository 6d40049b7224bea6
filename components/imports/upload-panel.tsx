"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useRef, useState } from "react";
import { buttonClass, inputClass } from "@/components/ui/button";
import type { ImportKind } from "@/db/schema/operations";
import { KIND_LABELS, KIND_ORDER } from "./kinds";

type UploadError = { message: string; existingImportId?: number | null };

/** Sends the file as the request body with upload progress (XMLHttpRequest reports it). */
function sendFile(
  file: File,
  kind: ImportKind,
  onProgress: (fraction: number) => void,
): Promise<{ status: number; body: unknown }> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    const query = new URLSearchParams({ kind, name: file.name });
    xhr.open("PUT", `/api/imports?${query.toString()}`);
    xhr.setRequestHeader("content-type", "text/csv");
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = null;
      }
      resolve({ status: xhr.status, body });
    };
    xhr.onerror = () =>
      reject(new Error("The upload was interrupted. Check the connection and try again."));
    xhr.send(file);
  });
}

export function UploadPanel({ limitMb }: { limitMb: number }) {
  const router = useRouter();
  const input = useRef<HTMLInputElement>(null);
  const [kind, setKind] = useState<ImportKind>("repairs");
  const [file, setFile] = useState<File | null>(null);
  const [isDragging, setDragging] = useState(false);
  const [progress, setProgress] = useState<number | null>(null);
  const [error, setError] = useState<UploadError | null>(null);

  const choose = (f: File | undefined) => {
    setError(null);
    if (!f) return;
    if (f.size > limitMb * 1_048_576) {
      setError({ message: `The file is larger than this organisation's limit of ${limitMb} MB.` });
      return;
    }
    setFile(f);
  };

  async function upload() {
    if (!file) return;
    setError(null);
    setProgress(0);
    try {
      const { status, body } = await sendFile(file, kind, setProgress);
      const b = (body ?? {}) as {
        importId?: number;
        error?: string;
        existingImportId?: number | null;
      };
      if (status === 201 && b.importId) {
        router.push(`/imports/${b.importId}`);
        return;
      }
      setError({
        message: b.error ?? `The upload failed (HTTP ${status}).`,
        existingImportId: b.existingImportId,
      });
    } catch (e) {
      setError({ message: (e as Error).message });
    } finally {
      setProgress(null);
    }
  }

  return (
    <div className="space-y-4">
      <label className="block max-w-md text-sm">
        <span className="mb-1 block font-medium">What the file holds</span>
        <select
          className={inputClass}
          value={kind}
          onChange={(e) => setKind(e.target.value as ImportKind)}
        >
          {KIND_ORDER.map((k) => (
            <option key={k} value={k}>
              {KIND_LABELS[k]}
            </option>
          ))}
        </select>
      </label>
      <div
        role="button"
        tabIndex={0}
        aria-label="Choose a CSV file, or drop one here"
        onClick={() => input.current?.click()}
        onKeyDown={(e) => {
          if (e.key === "Enter" || e.key === " ") input.current?.click();
        }}
        onDragOver={(e) => {
          e.preventDefault();
          setDragging(true);
        }}
        onDragLeave={() => setDragging(false)}
        onDrop={(e) => {
          e.preventDefault();
          setDragging(false);
          choose(e.dataTransfer.files[0]);
        }}
        className={`flex min-h-32 cursor-pointer flex-col items-center justify-center rounded-lg border-2 border-dashed p-6 text-center ${
          isDragging ? "border-sea-600 bg-sea-50" : "border-line-strong bg-paper"
        }`}
      >
        <p className="font-medium text-ink">
          {file ? file.name : "Drop a CSV file here, or click to choose one"}
        </p>
        <p className="mt-1 text-sm text-ink-soft">
          {file
            ? `${(file.size / 1_048_576).toFixed(1)} MB`
            : `Comma, semicolon or tab separated; up to ${limitMb} MB.`}
        </p>
        <input
          ref={input}
          type="file"
          accept=".csv,.txt,.tsv,text/csv"
          className="sr-only"
          data-testid="file-input"
          onChange={(e) => choose(e.target.files?.[0])}
        />
      </div>
      {progress !== null ? (
        <div>
          <div
            role="progressbar"
            aria-label="Upload"
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={Math.round(progress * 100)}
            className="h-2 overflow-hidden rounded bg-line/60"
          >
            <div
              className="h-full bg-sea-600"
              style={{ width: `${Math.round(progress * 100)}%` }}
            />
          </div>
          <p className="mt-1 text-sm text-ink-soft">Uploading… {Math.round(progress * 100)}%</p>
        </div>
      ) : null}
      {error ? (
        <p role="alert" className="rounded-md bg-alarm-100 px-3 py-2 text-sm text-alarm-700">
          {error.message}{" "}
          {error.existingImportId ? (
            <Link href={`/imports/${error.existingImportId}`}>Open that import</Link>
          ) : null}
        </p>
      ) : null}
      <button
        type="button"
        className={buttonClass.primary}
        disabled={!file || progress !== null}
        onClick={upload}
      >
        Upload and map columns
      </button>
    </div>
  );
}

"use client";

import { useState } from "react";
import { cardFileUrl } from "./card-types";

/** The card as large as the screen allows: the photo itself, the PDF in the browser's viewer, or a link. */
export function CardImage({ id, mime, hasCard, label }: { id: number; mime: string | null; hasCard: boolean; label: string }) {
  const [broken, setBroken] = useState(false);
  const url = cardFileUrl(id);
  if (!hasCard || broken) {
    return (
      <div className="flex min-h-48 items-center justify-center rounded-lg border border-dashed border-ink-300 bg-ink-50 p-6 text-center text-ink-600">
        <p>
          <span aria-hidden="true">▭ </span>
          {hasCard ? "The card's file could not be shown (it may not be in storage)." : "No file was uploaded for this card."}
        </p>
      </div>
    );
  }
  if (mime === "application/pdf") {
    return (
      <div className="space-y-2">
        <object data={url} type="application/pdf" className="h-[70vh] w-full rounded-lg border border-ink-200 bg-white" aria-label={label}>
          <p className="p-4">
            This browser cannot show the PDF here.{" "}
            <a href={url} className="font-medium text-fjord-700 underline">
              Open the PDF
            </a>
          </p>
        </object>
        <a href={url} target="_blank" rel="noreferrer" className="inline-block text-sm font-medium text-fjord-700 underline">
          Open the PDF in a new tab
        </a>
      </div>
    );
  }
  if (mime === "image/heic") {
    return (
      <p className="rounded-lg border border-ink-200 bg-white p-4">
        This photo is in HEIC format, which most browsers cannot show.{" "}
        <a href={url} className="font-medium text-fjord-700 underline">
          Download the photo
        </a>
      </p>
    );
  }
  return (
    <a href={url} target="_blank" rel="noreferrer" className="block" title="Open the full-size photo">
      {/* eslint-disable-next-line @next/next/no-img-element -- a private, permission-checked file; not for the image optimiser */}
      <img
        src={url}
        alt={label}
        onError={() => setBroken(true)}
        className="max-h-[75vh] w-full rounded-lg border border-ink-200 bg-white object-contain"
      />
    </a>
  );
}

/** A small preview for lists: the thumbnail of a photo, or a document sign. */
export function CardThumb({ id, mime, hasThumbnail, label }: { id: number; mime: string | null; hasThumbnail: boolean; label: string }) {
  const [broken, setBroken] = useState(false);
  if (hasThumbnail && !broken) {
    return (
      // eslint-disable-next-line @next/next/no-img-element -- private file behind a permission check
      <img
        src={cardFileUrl(id, "thumbnail")}
        alt={label}
        onError={() => setBroken(true)}
        className="h-16 w-24 rounded border border-ink-200 bg-white object-cover"
      />
    );
  }
  return (
    <span
      className="flex h-16 w-24 items-center justify-center rounded border border-ink-200 bg-ink-50 text-xs font-semibold text-ink-600"
      aria-label={label}
    >
      <span aria-hidden="true">{mime === "application/pdf" ? "PDF" : "▭"}</span>
    </span>
  );
}

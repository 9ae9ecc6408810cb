"use client";

import { useEffect, useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useIdempotencyKey } from "@/lib/client/idempotency";
import { useForm, type FieldPath } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { CERTIFICATION_CARD_MAX_BYTES, CERTIFICATION_TYPE_LABELS, CERTIFICATION_TYPES, certificationCardInput } from "@coldtrail/core";
import { ApiError } from "@/lib/client/fetch-json";
import { CameraIcon, FileIcon } from "../_components/icons";
import { FieldError } from "@/components/form";

type FormIn = z.input<typeof certificationCardInput>;
type FormOut = z.output<typeof certificationCardInput>;

const TYPE_HINTS: Record<(typeof CERTIFICATION_TYPES)[number], string> = {
  type_i: "Small appliances",
  type_ii: "High and very-high pressure appliances",
  type_iii: "Low-pressure appliances",
  universal: "All of the above",
};

const inputClass =
  "mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-3 text-lg text-ink-950 shadow-sm aria-[invalid=true]:border-sev-critical";
const labelClass = "block text-base font-semibold text-ink-900";
const pickerClass =
  "flex min-h-14 cursor-pointer items-center justify-center gap-2 rounded-lg border-2 px-4 py-3 text-center text-base font-semibold has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-fjord-500";

async function postCard(values: FormOut, file: File, idempotency: Record<string, string>): Promise<{ id: number }> {
  const data = new FormData();
  for (const t of values.types) data.append("types", t);
  data.set("certifyingOrganisation", values.certifyingOrganisation);
  data.set("certificateNumber", values.certificateNumber);
  if (values.issuedOn) data.set("issuedOn", values.issuedOn);
  data.set("card", file, file.name);
  const res = await fetch("/api/certifications", { method: "POST", body: data, headers: { accept: "application/json", ...idempotency } });
  const body = res.headers.get("content-type")?.includes("application/json") ? await res.json() : null;
  if (!res.ok) throw new ApiError(res.status, body?.error?.message ?? `Upload failed (${res.status})`, body?.error?.fieldErrors ?? {});
  return body as { id: number };
}

/** Phone first: big checkboxes for the types, camera capture or a file picker for the card. */
export function CardUploadForm() {
  const router = useRouter();
  const queryClient = useQueryClient();
  const uid = useId();
  const [file, setFile] = useState<File | null>(null);
  const [preview, setPreview] = useState<string | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);

  const { register, handleSubmit, formState, setError } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(certificationCardInput),
    mode: "onTouched",
    defaultValues: { types: [], certifyingOrganisation: "", certificateNumber: "", issuedOn: "" },
  });
  const errors = formState.errors;

  useEffect(() => {
    if (!file || !file.type.startsWith("image/")) {
      setPreview(null);
      return;
    }
    const url = URL.createObjectURL(file);
    setPreview(url);
    return () => URL.revokeObjectURL(url);
  }, [file]);

  const choose = (chosen: File | undefined) => {
    setFormError(null);
    if (!chosen) return;
    // The browser only mirrors the server's checks (which read the file's bytes).
    if (chosen.size > CERTIFICATION_CARD_MAX_BYTES) {
      setFile(null);
      setFileError(`The file is larger than ${CERTIFICATION_CARD_MAX_BYTES / 1024 / 1024} MB; take a smaller photo or scan`);
      return;
    }
    setFileError(null);
    setFile(chosen);
  };

  const idem = useIdempotencyKey();
  const save = useMutation({
    mutationFn: ({ values, card }: { values: FormOut; card: File }) => postCard(values, card, idem.headers),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: ["certifications"] });
      router.push("/certifications?uploaded=1");
    },
    onError: (err) => {
      if (err instanceof ApiError) {
        for (const [field, messages] of Object.entries(err.fieldErrors)) {
          if (field === "card") setFileError(messages[0] ?? "This file cannot be used");
          else setError(field as FieldPath<FormIn>, { type: "server", message: messages[0] });
        }
        setFormError(err.message);
      } else {
        setFormError("The card could not be sent. Check your connection; nothing was saved.");
      }
    },
  });

  const onSubmit = handleSubmit(
    (values) => {
      setFormError(null);
      if (!file) {
        setFileError("Take a photo of the card or choose a photo or PDF of it");
        setFormError("Some fields need attention before the card can be sent.");
        return;
      }
      save.mutate({ values, card: file });
    },
    () => {
      if (!file) setFileError("Take a photo of the card or choose a photo or PDF of it");
      setFormError("Some fields need attention before the card can be sent.");
    },
  );

  const err = (name: keyof typeof errors) => errors[name]?.message;
  const describedBy = (name: string, has: boolean) => (has ? `${uid}-${name}-error` : undefined);

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-7">
      {formError && (
        <p role="alert" className="rounded-lg border border-sev-critical/50 bg-red-50 px-4 py-3 font-medium text-sev-critical">
          ⚠ {formError}
        </p>
      )}

      <fieldset aria-describedby={describedBy("card", Boolean(fileError))}>
        <legend className={labelClass}>Photo or PDF of the card</legend>
        <p className="text-sm text-ink-600">Both sides if the number is on the back. JPEG, PNG, WebP, HEIC or PDF, up to 10 MB.</p>
        <div className="mt-2 grid gap-2 sm:grid-cols-2">
          <label className={`${pickerClass} border-fjord-600 bg-fjord-600 text-white hover:bg-fjord-700`}>
            <CameraIcon /> Take a photo of the card
            <input
              type="file"
              accept="image/*,application/pdf"
              capture="environment"
              className="sr-only"
              onChange={(e) => choose(e.target.files?.[0])}
            />
          </label>
          <label className={`${pickerClass} border-ink-300 bg-white text-ink-900 hover:border-fjord-600`}>
            <FileIcon /> Choose a photo or PDF
            <input
              type="file"
              accept="image/*,application/pdf"
              className="sr-only"
              onChange={(e) => choose(e.target.files?.[0])}
              data-testid="card-file"
            />
          </label>
        </div>
        {file && (
          <div className="mt-3 flex items-center gap-3 rounded-lg border border-ink-200 bg-white p-3" data-testid="chosen-card">
            {preview ? (
              // eslint-disable-next-line @next/next/no-img-element -- a local preview of the chosen file
              <img
                src={preview}
                alt="The chosen photo of the card"
                onError={() => setPreview(null)}
                className="h-20 w-28 rounded object-cover"
              />
            ) : (
              <span
                className="flex h-20 w-28 items-center justify-center rounded bg-ink-100 text-sm font-semibold text-ink-700"
                aria-hidden="true"
              >
                {file.type === "application/pdf" ? "PDF" : <FileIcon />}
              </span>
            )}
            <span className="min-w-0 flex-1 text-sm">
              <span className="block truncate font-medium text-ink-950">{file.name}</span>
              <span className="text-ink-600 tabular">{(file.size / 1024).toFixed(0)} KB</span>
            </span>
            <button type="button" onClick={() => setFile(null)} className="rounded-md border border-ink-300 px-3 py-2 text-sm">
              Remove
            </button>
          </div>
        )}
        <FieldError id={`${uid}-card-error`} message={fileError ?? undefined} />
      </fieldset>

      <fieldset aria-describedby={describedBy("types", Boolean(errors.types))}>
        <legend className={labelClass}>Certification type on the card</legend>
        <div className="mt-2 grid gap-2 sm:grid-cols-2">
          {CERTIFICATION_TYPES.map((t) => (
            <label
              key={t}
              className="flex min-h-14 cursor-pointer items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 py-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50"
            >
              <input type="checkbox" value={t} {...register("types")} className="size-5 accent-fjord-600" />
              <span>
                <span className="block font-semibold">{CERTIFICATION_TYPE_LABELS[t]}</span>
                <span className="block text-sm text-ink-600">{TYPE_HINTS[t]}</span>
              </span>
            </label>
          ))}
        </div>
        <FieldError id={`${uid}-types-error`} message={err("types")} />
      </fieldset>

      <div>
        <label htmlFor={`${uid}-org`} className={labelClass}>
          Certifying organisation
        </label>
        <input
          id={`${uid}-org`}
          {...register("certifyingOrganisation")}
          autoComplete="off"
          className={inputClass}
          aria-invalid={errors.certifyingOrganisation ? true : undefined}
          aria-describedby={describedBy("certifyingOrganisation", Boolean(errors.certifyingOrganisation))}
        />
        <p className="mt-1 text-sm text-ink-600">The testing organisation printed on the card.</p>
        <FieldError id={`${uid}-certifyingOrganisation-error`} message={err("certifyingOrganisation")} />
      </div>

      <div>
        <label htmlFor={`${uid}-number`} className={labelClass}>
          Certificate number
        </label>
        <input
          id={`${uid}-number`}
          {...register("certificateNumber")}
          autoComplete="off"
          autoCapitalize="characters"
          className={`${inputClass} tabular`}
          aria-invalid={errors.certificateNumber ? true : undefined}
          aria-describedby={describedBy("certificateNumber", Boolean(errors.certificateNumber))}
        />
        <FieldError id={`${uid}-certificateNumber-error`} message={err("certificateNumber")} />
      </div>

      <div>
        <label htmlFor={`${uid}-issued`} className={labelClass}>
          Issue date <span className="font-normal text-ink-600">(optional)</span>
        </label>
        <input
          id={`${uid}-issued`}
          type="date"
          {...register("issuedOn")}
          className={inputClass}
          aria-invalid={errors.issuedOn ? true : undefined}
          aria-describedby={describedBy("issuedOn", Boolean(errors.issuedOn))}
        />
        <FieldError id={`${uid}-issuedOn-error`} message={err("issuedOn")} />
      </div>

      <div className="sticky bottom-0 -mx-4 border-t border-ink-200 bg-white/95 px-4 py-3 backdrop-blur">
        <button
          type="submit"
          disabled={save.isPending}
          className="w-full rounded-lg bg-fjord-600 px-4 py-4 text-lg font-semibold text-white hover:bg-fjord-700 disabled:opacity-60"
        >
          {save.isPending ? "Sending…" : "Send the card for verification"}
        </button>
      </div>
    </form>
  );
}

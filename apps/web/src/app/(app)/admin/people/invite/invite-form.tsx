"use client";

import { useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Controller, useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { invitationInput } from "@coldtrail/core";
import type { AdminBranchPage } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { saveErrorMessage, submitOrExplain } from "@/lib/client/form-save";
import { AccessFields, accessPayload } from "../../_components/access-fields";
import { FieldError, FormAlert, inputClass, labelClass, primaryButton } from "../../_components/form-bits";
import { useIdempotencyKey } from "@/lib/client/idempotency";

type FormIn = z.input<typeof invitationInput>;
type FormOut = z.output<typeof invitationInput>;

export function InviteForm() {
  const uid = useId();
  const router = useRouter();
  const queryClient = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const branches = useQuery({
    queryKey: ["admin-branches", "open"],
    queryFn: () => fetchJson<AdminBranchPage>("/api/admin/branches?archived=exclude&pageSize=200"),
  });
  const form = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(invitationInput),
    mode: "onTouched",
    defaultValues: { email: "", name: "", roles: [], branchIds: [] },
  });
  const { register, handleSubmit, control, formState, setError } = form;
  const errors = formState.errors;

  const idem = useIdempotencyKey();
  const invite = useMutation({
    mutationFn: (input: FormOut) =>
      fetchJson<{ userId: number; mailSent: boolean }>("/api/admin/invitations", {
        method: "POST",
        headers: idem.headers,
        body: JSON.stringify({ ...input, ...accessPayload(input) }),
      }),
    onSuccess: async (res, input) => {
      await queryClient.invalidateQueries({ queryKey: ["people"] });
      if (!res.mailSent) {
        router.push(`/admin/people/${res.userId}?mail=failed`);
        return;
      }
      router.push(`/admin/people?invited=${encodeURIComponent(input.email)}`);
    },
    onError: (err) => {
      setFormError(saveErrorMessage(err, setError, "The invitation could not be sent. Check your connection; nothing was saved."));
    },
  });

  const onSubmit = submitOrExplain(handleSubmit, {
    save: invite.mutate,
    setFormError,
    invalid: "Some fields need attention before the invitation can be sent.",
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6 rounded-lg border border-ink-200 bg-white p-5">
      <FormAlert message={formError} />
      <div className="grid gap-5 sm:grid-cols-2">
        <div>
          <label htmlFor={`${uid}-name`} className={labelClass}>
            Full name
          </label>
          <input
            id={`${uid}-name`}
            autoComplete="off"
            {...register("name")}
            className={inputClass}
            aria-invalid={errors.name ? true : undefined}
            aria-describedby={errors.name ? `${uid}-name-error` : undefined}
          />
          <FieldError id={`${uid}-name-error`} message={errors.name?.message} />
        </div>
        <div>
          <label htmlFor={`${uid}-email`} className={labelClass}>
            E-mail address
          </label>
          <input
            id={`${uid}-email`}
            type="email"
            autoComplete="off"
            {...register("email")}
            className={inputClass}
            aria-invalid={errors.email ? true : undefined}
            aria-describedby={errors.email ? `${uid}-email-error` : undefined}
          />
          <FieldError id={`${uid}-email-error`} message={errors.email?.message} />
        </div>
      </div>
      <Controller
        control={control}
        name="roles"
        render={({ field: rolesField }) => (
          <Controller
            control={control}
            name="branchIds"
            render={({ field: branchesField }) => (
              <AccessFields
                value={{
                  roles: rolesField.value ?? [],
                  branchIds: (branchesField.value ?? []).map(Number),
                }}
                onChange={(next) => {
                  rolesField.onChange(next.roles);
                  branchesField.onChange(next.branchIds);
                }}
                branches={branches.data?.rows ?? []}
                errors={{ roles: errors.roles?.message, branchIds: errors.branchIds?.message }}
              />
            )}
          />
        )}
      />
      <button type="submit" disabled={invite.isPending} className={primaryButton}>
        {invite.isPending ? "Sending the invitation…" : "Send the invitation"}
      </button>
    </form>
  );
}

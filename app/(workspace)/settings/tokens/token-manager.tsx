"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useMemo, useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { columnsFor, DataTable } from "@/components/ui/data-table";
import { DateTime } from "@/components/ui/date-time";
import { TextField } from "@/components/ui/field";
import { applyApiIssues, apiIssues, fieldMessage, formFailure } from "@/components/ui/form";
import { EmptyState, ErrorNote } from "@/components/ui/panel";
import { request } from "@/lib/client/api-client";
import { createTokenSchema } from "@/lib/shared/schemas/api";

type Token = {
  id: string;
  name: string;
  prefix: string;
  createdAt: string;
  lastUsedAt: string | null;
  expiresAt: string | null;
  revokedAt: string | null;
};

const col = columnsFor<Token>();

/** The token form: the API's schema, and the API's field errors under the fields. */
export function TokenCreateForm({ onCreated }: { onCreated: (token: Token & { token: string }) => void }) {
  const [failure, setFailure] = useState<string | undefined>();
  const form = useForm({
    resolver: zodResolver(createTokenSchema),
    defaultValues: { name: "", expiresInDays: undefined },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setFailure(undefined);
    try {
      const created = await request<Token & { token: string }>("/api/v1/tokens", {
        method: "POST",
        body: JSON.stringify(body),
      });
      onCreated(created);
      form.reset();
    } catch (error) {
      setFailure(formFailure(error, applyApiIssues(apiIssues(error), form.setError, ["name", "expiresInDays"])));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label="New API token">
      <div className="flex flex-wrap items-start gap-3">
        <TextField
          label="Name"
          placeholder="lab CI"
          fieldClassName="w-64"
          error={fieldMessage("The name", errors.name)}
          {...form.register("name")}
        />
        <TextField
          label="Expires after (days)"
          type="number"
          placeholder="never"
          fieldClassName="w-44"
          hint="1 to 366; empty for no expiry."
          error={fieldMessage("The expiry", errors.expiresInDays)}
          {...form.register("expiresInDays", {
            setValueAs: (v: unknown) => (v === "" || v === null || v === undefined ? undefined : Number(v)),
          })}
        />
        <Button type="submit" variant="primary" disabled={isSubmitting} className="mt-5">
          {isSubmitting ? "Creating…" : "Create token"}
        </Button>
      </div>
      {failure ? <ErrorNote title="The token was not created">{failure}</ErrorNote> : null}
    </form>
  );
}

export function TokenManager({ initial }: { initial: Token[] }) {
  const [tokens, setTokens] = useState(initial);
  const [fresh, setFresh] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [filter, setFilter] = useState("");

  const columns = useMemo(() => {
    async function revoke(id: string) {
      try {
        await request(`/api/v1/tokens/${id}`, { method: "DELETE" });
        setTokens((list) => list.map((t) => (t.id === id ? { ...t, revokedAt: new Date().toISOString() } : t)));
        setError(null);
      } catch (e) {
        setError(
          `The token was not revoked: ${e instanceof Error ? e.message : "the server did not answer"}. It still works; try again.`,
        );
      }
    }
    return col.columns([
      col.accessor("name", { header: "Name", sortFn: "text" }),
      col.accessor("prefix", {
        header: "Starts with",
        enableSorting: false,
        cell: (c) => <span className="font-mono text-xs">{c.getValue()}…</span>,
      }),
      col.accessor("createdAt", {
        header: "Created",
        sortFn: "basic",
        enableGlobalFilter: false,
        cell: (c) => <DateTime value={c.getValue()} className="tabular" />,
      }),
      col.accessor("lastUsedAt", {
        header: "Last used",
        sortFn: "basic",
        sortUndefined: "last",
        enableGlobalFilter: false,
        cell: (c) => <DateTime value={c.getValue()} className="tabular" />,
      }),
      col.accessor("expiresAt", {
        header: "Expires",
        sortFn: "basic",
        enableGlobalFilter: false,
        cell: (c) =>
          c.getValue() ? (
            <DateTime value={c.getValue()} day className="tabular" />
          ) : (
            <span className="text-ink-faint">never</span>
          ),
      }),
      col.display({
        id: "action",
        header: () => <span className="sr-only">Action</span>,
        cell: (c) => {
          const t = c.row.original;
          return t.revokedAt ? (
            <span className="text-ink-faint">
              revoked <DateTime value={t.revokedAt} day />
            </span>
          ) : (
            <Button size="sm" variant="danger" onClick={() => revoke(t.id)} aria-label={`Revoke ${t.name}`}>
              Revoke
            </Button>
          );
        },
      }),
    ]);
  }, []);

  return (
    <div className="mt-8 space-y-8">
      <TokenCreateForm
        onCreated={(created) => {
          setFresh(created.token);
          setTokens((list) => [{ ...created, lastUsedAt: null, revokedAt: null }, ...list]);
        }}
      />
      {error ? <ErrorNote title="Not revoked">{error}</ErrorNote> : null}
      {fresh ? (
        <div role="status" className="rounded border border-pass/30 bg-pass-tint px-4 py-3 text-sm">
          <p className="font-medium">Copy your new token now; it will not be shown again.</p>
          <code className="mt-2 block font-mono text-xs break-all">{fresh}</code>
        </div>
      ) : null}
      <div className="space-y-2">
        {tokens.length > 0 ? (
          <TextField
            label="Filter tokens"
            type="search"
            placeholder="Name or start"
            fieldClassName="w-64"
            value={filter}
            onChange={(e) => setFilter(e.target.value)}
          />
        ) : null}
        <DataTable
          label="Your API tokens"
          data={tokens}
          columns={columns}
          getRowId={(t) => t.id}
          filter={filter}
          initialSorting={[{ id: "createdAt", desc: true }]}
          empty={<EmptyState title="No tokens yet">Create one above to use the API from a script or CI.</EmptyState>}
        />
      </div>
    </div>
  );
}

import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type {
  AuditQueryInput,
  CompanyProfile,
  CompanySettings,
  CompanySettingsPatch,
  FeeItemInput,
  InvitationCreateInput,
  PersonStatus,
  PriceBook,
  Role,
  StaffRole,
} from '@underfoot/core';
import { api } from '@/lib/api-client';

/** What the API answers; the shapes follow apps/server/src/modules/company and modules/users. */

export interface Company {
  id: string;
  profile: CompanyProfile;
  settings: CompanySettings;
  logo: { url: string; width: number; height: number } | null;
  /** The page agents sign up on, while the company allows it. */
  agentSignUpUrl: string | null;
  updatedAt: string;
}

export interface Person {
  id: string;
  name: string;
  email: string;
  role: Role;
  status: PersonStatus;
  emailVerified: boolean;
  createdAt: string;
  disabledAt: string | null;
  lastSignInAt: string | null;
  isYou: boolean;
  allowed: { changeRole: boolean; disable: boolean; enable: boolean; resendInvitation: boolean };
}

export interface FeeListItem {
  id: string;
  kind: 'base' | 'add_on';
  name: string;
  description: string;
  priceCents: number;
  active: boolean;
  sortOrder: number;
  orderCount: number;
  updatedAt: string;
}

export interface StoredPriceBook {
  priceBook: PriceBook;
  isDefault: boolean;
  updatedAt: string | null;
  updatedBy: { id: string; name: string } | null;
}

export interface AuditEntry {
  id: number;
  at: string;
  action: string;
  actionLabel: string;
  actor: { id: string; name: string; email: string } | null;
  subject: { type: string; id: string; label: string } | null;
  detailText: string;
  ip: string | null;
}

export interface AuditPage {
  entries: AuditEntry[];
  total: number;
  page: number;
  pageSize: number;
}

export interface AuditFilters {
  actions: { code: string; label: string }[];
  actors: { id: string; name: string; email: string }[];
}

export const companyKeys = {
  all: ['company'] as const,
  company: () => [...companyKeys.all, 'profile'] as const,
  people: () => [...companyKeys.all, 'people'] as const,
  fees: () => [...companyKeys.all, 'fees'] as const,
  priceBook: () => [...companyKeys.all, 'price-book'] as const,
  audit: (query: AuditQueryInput) => [...companyKeys.all, 'audit', query] as const,
  auditFilters: () => [...companyKeys.all, 'audit', 'filters'] as const,
};

// Forms show their own field errors and alerts.
const formMeta = { errorToast: false } as const;

export function companyQueryOptions() {
  return queryOptions({
    queryKey: companyKeys.company(),
    queryFn: () => api.get<{ company: Company }>('/api/company').then((b) => b.company),
  });
}

function useSetCompany() {
  const queryClient = useQueryClient();
  return (company: Company) => {
    queryClient.setQueryData(companyKeys.company(), company);
    void queryClient.invalidateQueries({ queryKey: [...companyKeys.all, 'audit'] });
  };
}

export function useSaveProfile() {
  const setCompany = useSetCompany();
  return useMutation({
    mutationFn: (profile: CompanyProfile) => api.put<{ company: Company }>('/api/company/profile', profile).then((b) => b.company),
    meta: formMeta,
    onSuccess: setCompany,
  });
}

export function useSaveSettings() {
  const setCompany = useSetCompany();
  return useMutation({
    mutationFn: (patch: CompanySettingsPatch) => api.patch<{ company: Company }>('/api/company/settings', patch).then((b) => b.company),
    meta: formMeta,
    onSuccess: setCompany,
  });
}

export function useUploadLogo() {
  const setCompany = useSetCompany();
  return useMutation({
    mutationFn: (file: File) => {
      const body = new FormData();
      body.append('logo', file);
      return api.post<{ company: Company }>('/api/company/logo', body).then((b) => b.company);
    },
    meta: formMeta,
    onSuccess: setCompany,
  });
}

export function useRemoveLogo() {
  const setCompany = useSetCompany();
  return useMutation({
    mutationFn: () => api.delete<{ company: Company }>('/api/company/logo').then((b) => b.company),
    onSuccess: setCompany,
  });
}

// ---------- people ----------

export function peopleQueryOptions() {
  return queryOptions({
    queryKey: companyKeys.people(),
    queryFn: () => api.get<{ people: Person[] }>('/api/users').then((b) => b.people),
  });
}

function useRefreshPeople() {
  const queryClient = useQueryClient();
  return () => {
    void queryClient.invalidateQueries({ queryKey: companyKeys.people() });
    void queryClient.invalidateQueries({ queryKey: [...companyKeys.all, 'audit'] });
  };
}

export function useInvite() {
  const refresh = useRefreshPeople();
  return useMutation({
    mutationFn: (input: InvitationCreateInput) => api.post<{ userId: string }>('/api/users/invitations', input),
    meta: formMeta,
    onSuccess: refresh,
  });
}

/** Role changes, disabling, re-enabling and re-sending: each answers with the person as they now are. */
export function usePersonAction() {
  const refresh = useRefreshPeople();
  return useMutation({
    mutationFn: (action: { kind: 'role'; id: string; role: StaffRole } | { kind: 'disable' | 'enable' | 'resend'; id: string }) => {
      switch (action.kind) {
        case 'role':
          return api.put<{ person: Person }>(`/api/users/${action.id}/role`, { role: action.role }).then((b) => b.person);
        case 'disable':
          return api.post<{ person: Person }>(`/api/users/${action.id}/disable`).then((b) => b.person);
        case 'enable':
          return api.post<{ person: Person }>(`/api/users/${action.id}/enable`).then((b) => b.person);
        case 'resend':
          return api.post<{ person: Person }>(`/api/users/${action.id}/invitation`).then((b) => b.person);
      }
    },
    // The page explains a refusal (e.g. the last office user) next to the person.
    meta: formMeta,
    onSettled: refresh,
  });
}

// ---------- fee list ----------

export function feesQueryOptions() {
  return queryOptions({
    queryKey: companyKeys.fees(),
    queryFn: () => api.get<{ items: FeeListItem[] }>('/api/company/fees').then((b) => b.items),
  });
}

export function useSaveFee() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, item }: { id: string | null; item: FeeItemInput }) =>
      (id
        ? api.put<{ item: FeeListItem }>(`/api/company/fees/${id}`, item)
        : api.post<{ item: FeeListItem }>('/api/company/fees', item)
      ).then((b) => b.item),
    meta: formMeta,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: companyKeys.fees() });
      void queryClient.invalidateQueries({ queryKey: [...companyKeys.all, 'audit'] });
    },
  });
}

export function useReorderFees() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (ids: string[]) => api.put<{ items: FeeListItem[] }>('/api/company/fees/order', { ids }).then((b) => b.items),
    onSuccess: (items) => queryClient.setQueryData(companyKeys.fees(), items),
    onError: () => void queryClient.invalidateQueries({ queryKey: companyKeys.fees() }),
  });
}

// ---------- price book ----------

export function priceBookQueryOptions() {
  return queryOptions({
    queryKey: companyKeys.priceBook(),
    queryFn: () => api.get<StoredPriceBook>('/api/company/price-book'),
  });
}

export function useSavePriceBook() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (book: PriceBook) => api.put<StoredPriceBook>('/api/company/price-book', book),
    meta: formMeta,
    onSuccess: (stored) => {
      queryClient.setQueryData(companyKeys.priceBook(), stored);
      void queryClient.invalidateQueries({ queryKey: [...companyKeys.all, 'audit'] });
    },
  });
}

// ---------- audit trail ----------

export function auditSearch(query: AuditQueryInput): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) if (value !== undefined && value !== '') params.set(key, String(value));
  return params.toString();
}

export function auditQueryOptions(query: AuditQueryInput) {
  return queryOptions({
    queryKey: companyKeys.audit(query),
    queryFn: ({ signal }) => api.get<AuditPage>(`/api/company/audit?${auditSearch(query)}`, { signal }),
    // Paging and filtering keep the last page on screen until the next arrives.
    placeholderData: keepPreviousData,
  });
}

export function auditFiltersQueryOptions() {
  return queryOptions({
    queryKey: companyKeys.auditFilters(),
    queryFn: () => api.get<AuditFilters>('/api/company/audit/filters'),
  });
}

/** The CSV download is a plain link: the browser saves the file with the session cookie. */
export function auditExportHref(query: Omit<AuditQueryInput, 'page' | 'pageSize'>): string {
  const search = auditSearch(query);
  return `/api/company/audit/export${search ? `?${search}` : ''}`;
}

import { QueryClient, type DefaultOptions, type UseMutationOptions } from '@tanstack/react-query';
import { isApiError } from './api-client';

export const queryConfig = {
  queries: {
    refetchOnWindowFocus: false,
    staleTime: 30_000,
    // Retrying a 4xx only delays the message the person needs to see.
    retry: (failureCount, error) => !isApiError(error) || (error.status >= 500 && failureCount < 2),
  },
  mutations: { retry: false },
} satisfies DefaultOptions;

export function createQueryClient(): QueryClient {
  return new QueryClient({ defaultOptions: queryConfig });
}

/** Extra options a caller may pass to a query hook (the key and fetcher stay with the API file). */
export type QueryConfig<T extends (...args: never[]) => object> = Omit<ReturnType<T>, 'queryKey' | 'queryFn'>;

export type MutationConfig<TFn extends (...args: never[]) => Promise<unknown>> = UseMutationOptions<
  Awaited<ReturnType<TFn>>,
  Error,
  Parameters<TFn>[0]
>;

import { type WeatherImportBody, weatherImportResultSchema } from '@common/contracts/weather';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { analysisKeys } from './analysis-keys';

export const importWeather = (slug: string, body: WeatherImportBody) =>
  api(`/api/trials/${encodeURIComponent(slug)}/weather/import`, weatherImportResultSchema, {
    method: 'POST',
    body,
  });

/** Preview (dryRun) or import; an import changes the season summary and the site's weather. */
export function useImportWeather(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: WeatherImportBody) => importWeather(slug, body),
    onSuccess: async (result, body) => {
      if (result.dryRun) return;
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: analysisKeys.season(slug) }),
        queryClient.invalidateQueries({ queryKey: analysisKeys.weather(slug, body.siteId) }),
      ]);
    },
  });
}

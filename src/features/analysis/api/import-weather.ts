import { type WeatherImportBody, weatherImportResultSchema } from '@common/contracts/weather';
import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { useInvalidateTrial } from '@/lib/trial-keys';

export const importWeather = (slug: string, body: WeatherImportBody) =>
  api(`/api/trials/${encodeURIComponent(slug)}/weather/import`, weatherImportResultSchema, {
    method: 'POST',
    body,
  });

/** Preview (dryRun) or import; an import changes the season summary and the site's weather. */
export function useImportWeather(slug: string) {
  const invalidate = useInvalidateTrial();
  return useMutation({
    mutationFn: (body: WeatherImportBody) => importWeather(slug, body),
    onSuccess: async (result) => {
      if (!result.dryRun) await invalidate(slug, 'weather');
    },
  });
}

import { type WeatherDay, weatherDaySchema } from '@common/contracts/weather';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { analysisKeys } from './analysis-keys';

export interface WeatherDayInput {
  siteId: string;
  date: string;
  tminC: number | null;
  tmaxC: number | null;
  rainMm: number | null;
}

export const putWeatherDay = (slug: string, { siteId, date, ...body }: WeatherDayInput) =>
  api<WeatherDay>(
    `/api/trials/${encodeURIComponent(slug)}/weather/${siteId}/${date}`,
    weatherDaySchema,
    {
      method: 'PUT',
      body,
    },
  );

/** One day typed in by hand; it changes the season summary and that site's weather. */
export function usePutWeatherDay(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: WeatherDayInput) => putWeatherDay(slug, input),
    onSuccess: async (_day, input) => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: analysisKeys.season(slug) }),
        queryClient.invalidateQueries({ queryKey: analysisKeys.weather(slug, input.siteId) }),
      ]);
    },
  });
}

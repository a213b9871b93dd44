import { useEffect } from 'react';
import { useLocation, useParams } from 'react-router-dom';
import { useTrials } from '@/features/trials/api/get-trials';

/**
 * Every page's document title, in one place: the page's own heading, the trial it belongs to
 * (when it is one of a trial's pages and the heading does not already name it), then
 * "Rowtally". It follows the heading as the page loads its data.
 */
export function usePageTitle() {
  const { pathname } = useLocation();
  const { slug } = useParams();
  const { data } = useTrials();
  const trialTitle = slug ? data?.trials.find((t) => t.slug === slug)?.title : undefined;

  useEffect(() => {
    const main = document.getElementById('main');
    if (!main) return;
    const update = () => {
      const heading = main.querySelector('h1')?.textContent?.trim();
      const parts = [
        heading,
        trialTitle && !heading?.includes(trialTitle) ? trialTitle : undefined,
      ];
      const title = [...parts.filter(Boolean), 'Rowtally'].join(' · ');
      if (document.title !== title) document.title = title;
    };
    update();
    const observer = new MutationObserver(update);
    observer.observe(main, { childList: true, subtree: true, characterData: true });
    return () => observer.disconnect();
  }, [pathname, trialTitle]);
}

/** Every client route, so links and the router agree. */
export const paths = {
  dashboard: {
    pattern: "/",
    to: () => "/",
  },
  bench: {
    pattern: "/benches/:benchId",
    to: (benchId: number) => `/benches/${benchId}`,
  },
} as const;

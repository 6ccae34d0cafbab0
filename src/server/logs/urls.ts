/** Page and API paths of logs (pure; pages and services share them). */
export function logsUrl(surveyId: string): string {
  return `/surveys/${encodeURIComponent(surveyId)}/logs`;
}

export function logUrl(surveyId: string, logId: number): string {
  return `${logsUrl(surveyId)}/${logId}`;
}

export function logOriginalUrl(surveyId: string, logId: number): string {
  return `/api/v1/surveys/${encodeURIComponent(surveyId)}/logs/${logId}/original`;
}

export function logProblemsCsvUrl(surveyId: string, logId: number): string {
  return `/api/v1/surveys/${encodeURIComponent(surveyId)}/logs/${logId}/problems`;
}

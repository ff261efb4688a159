using System.Globalization;
using System.Text;
using Microsoft.AspNetCore.Builder;
using Microsoft.AspNetCore.Http;
using Microsoft.AspNetCore.Routing;
using Microsoft.Extensions.DependencyInjection;
using Microsoft.Extensions.Logging;
using ModelWatch.Daemon.Alerts;
using ModelWatch.Daemon.Evidence;
using ModelWatch.Daemon.Fleet;
using ModelWatch.Daemon.Hosting;
using ModelWatch.Daemon.Options;
using ModelWatch.Store.Configuration;
using Npgsql;

namespace ModelWatch.Daemon.Web;

/// <summary>
/// The read-only evidence pages on the daemon's HTTP endpoint (<c>Web:Enabled</c>): <c>/</c> the fleet,
/// <c>/models/{key}</c> one model, <c>/alerts/{id}</c> an alert's evidence report (the page <c>explain --html</c>
/// writes). Every page is self-contained (inline CSS and SVG, no script, nothing fetched from anywhere), is sent with
/// <c>Cache-Control: no-store</c> and a Content-Security-Policy that forbids any other request, and asks for the
/// bearer token when <c>Web:AccessToken</c> is set.
/// </summary>
internal static class WebPages
{
    /// <summary>The policy every page is served with: nothing loads, inline styles only, no framing, no forms.</summary>
    public const string ContentSecurityPolicy = "default-src 'none'; style-src 'unsafe-inline'; img-src 'self' data:; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";

    private static readonly TimeSpan CommandTimeout = TimeSpan.FromSeconds(30);

    /// <summary>Maps the pages onto the application.</summary>
    public static void Map(WebApplication app, WebOptions options)
    {
        BearerToken? token = string.IsNullOrEmpty(options.AccessToken) ? null : new BearerToken(options.AccessToken);
        string[] methods = [HttpMethods.Get, HttpMethods.Head];
        app.MapMethods("/", methods, Guard(token, FleetAsync));
        app.MapMethods("/models/{key}", methods, Guard(token, ModelAsync));
        app.MapMethods("/alerts/{id}", methods, Guard(token, AlertAsync));
    }

    private static RequestDelegate Guard(BearerToken? token, Func<HttpContext, CancellationToken, Task<(int Status, string Html)>> page) => async context =>
    {
        HttpResponse response = context.Response;
        response.Headers.CacheControl = "no-store";
        response.Headers.ContentSecurityPolicy = ContentSecurityPolicy;
        response.Headers.XContentTypeOptions = "nosniff";
        response.Headers["Referrer-Policy"] = "no-referrer";
        (int status, string html) result;
        if (token is not null && !token.Admits(context.Request))
        {
            response.Headers.WWWAuthenticate = "Bearer realm=\"modelwatch\"";
            result = (StatusCodes.Status401Unauthorized, PageLayout.Message("Sign-in needed", "These pages need the access token (Web:AccessToken) as 'Authorization: Bearer TOKEN'."));
        }
        else
        {
            try
            {
                result = await page(context, context.RequestAborted);
            }
            catch (Exception ex) when (ex is NpgsqlException or TimeoutException or InvalidOperationException && !context.RequestAborted.IsCancellationRequested)
            {
                string path = context.Request.Path.Value ?? "/";
                DaemonLog.LogWebPageFailed(context.RequestServices.GetRequiredService<ILoggerFactory>().CreateLogger(typeof(WebPages)), path, ex);
                result = (StatusCodes.Status503ServiceUnavailable, PageLayout.Message("State database unavailable", "The page could not be read from the state database; try again shortly."));
            }
        }

        response.StatusCode = result.status;
        response.ContentType = "text/html; charset=utf-8";
        byte[] body = Encoding.UTF8.GetBytes(result.html);
        response.ContentLength = body.Length;
        if (!HttpMethods.IsHead(context.Request.Method))
        {
            await response.Body.WriteAsync(body, context.RequestAborted);
        }
    };

    private static async Task<(int, string)> FleetAsync(HttpContext context, CancellationToken cancellationToken)
    {
        StoreDataSources databases = context.RequestServices.GetRequiredService<StoreDataSources>();
        TimeProvider time = context.RequestServices.GetRequiredService<TimeProvider>();
        IReadOnlyList<ModelStatus> rows = await new FleetStatusReader(databases.State, CommandTimeout).ReadAsync(time.GetUtcNow(), cancellationToken);
        return (StatusCodes.Status200OK, FleetPage.Render(rows, time.GetUtcNow()));
    }

    private static async Task<(int, string)> ModelAsync(HttpContext context, CancellationToken cancellationToken)
    {
        string key = context.GetRouteValue("key") as string ?? string.Empty;
        StoreDataSources databases = context.RequestServices.GetRequiredService<StoreDataSources>();
        TimeProvider time = context.RequestServices.GetRequiredService<TimeProvider>();
        if (await new EvidenceLoader(databases, CommandTimeout).LoadModelAsync(key, cancellationToken) is not { } evidence)
        {
            return (StatusCodes.Status404NotFound, PageLayout.Message("No such model", $"No model has the key '{key}'."));
        }

        IReadOnlyList<AlertView> open = await new AlertRepository(databases.State, CommandTimeout).ListAsync(key, "unresolved", 200, cancellationToken);
        return (StatusCodes.Status200OK, ModelPage.Render(evidence, open, time.GetUtcNow()));
    }

    private static async Task<(int, string)> AlertAsync(HttpContext context, CancellationToken cancellationToken)
    {
        string text = context.GetRouteValue("id") as string ?? string.Empty;
        StoreDataSources databases = context.RequestServices.GetRequiredService<StoreDataSources>();
        TimeProvider time = context.RequestServices.GetRequiredService<TimeProvider>();
        if (!long.TryParse(text, NumberStyles.None, CultureInfo.InvariantCulture, out long id)
            || await new EvidenceLoader(databases, CommandTimeout).LoadAlertAsync(id, readWindow: true, cancellationToken) is not { } evidence)
        {
            return (StatusCodes.Status404NotFound, PageLayout.Message("No such alert", $"No alert has the id '{text}'. Alert ids are the numbers 'modelwatch alerts' lists."));
        }

        return (StatusCodes.Status200OK, EvidenceHtml.Render(evidence, time.GetUtcNow(), served: true));
    }
}

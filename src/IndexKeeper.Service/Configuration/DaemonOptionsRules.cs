namespace IndexKeeper.Service.Configuration;

/// <summary>The daemon's part of <see cref="IndexKeeperOptionsValidator"/>: each failure names its setting.</summary>
internal static class DaemonOptionsRules
{
    public static void Check(List<string> errors, DaemonOptions daemon)
    {
        if (!ListenAddress.TryParse(daemon.Listen, out var listen))
        {
            errors.Add($"Daemon:Listen: '{daemon.Listen}' is not HOST:PORT with an IP address or localhost, IPv6 in brackets (e.g. 127.0.0.1:7717, [::1]:7717).");
        }
        else if (listen!.Address.IsIPv4MappedToIPv6)
        {
            // Binding a socket to a mapped address fails (EINVAL on Linux); the IPv4 address itself is what is meant.
            errors.Add($"Daemon:Listen: '{daemon.Listen}' is an IPv4-mapped IPv6 address; write the IPv4 address itself (e.g. {listen.Address.MapToIPv4()}:{listen.Port}).");
        }
        else if (!listen!.IsLoopback && string.IsNullOrWhiteSpace(daemon.Token) && string.IsNullOrWhiteSpace(daemon.TokenFile))
        {
            // Off loopback, anyone on the network could read the index and its document paths.
            errors.Add($"Daemon:TokenFile: the API listens on '{daemon.Listen}', which is not a loopback address; set Daemon:TokenFile (or Daemon:Token, e.g. from INDEXKEEPER_Daemon__Token) so requests need a bearer token, or listen on 127.0.0.1.");
        }

        if (!string.IsNullOrWhiteSpace(daemon.TokenFile) && !File.Exists(daemon.TokenFile))
        {
            errors.Add($"Daemon:TokenFile: the file '{daemon.TokenFile}' does not exist.");
        }

        if (daemon.Token is { } token && token.Length is > 0 and < 16)
        {
            errors.Add("Daemon:Token: use at least 16 characters.");
        }

        if (daemon.LogFormat is not ("auto" or "text" or "json" or "systemd"))
        {
            errors.Add($"Daemon:LogFormat: '{daemon.LogFormat}' is not allowed; use auto, text, json or systemd.");
        }

        if (daemon.OtlpProtocol is not ("grpc" or "http/protobuf"))
        {
            errors.Add($"Daemon:OtlpProtocol: '{daemon.OtlpProtocol}' is not allowed; use grpc or http/protobuf.");
        }

        if (!string.IsNullOrWhiteSpace(daemon.OtlpEndpoint) && !Uri.TryCreate(daemon.OtlpEndpoint, UriKind.Absolute, out _))
        {
            errors.Add($"Daemon:OtlpEndpoint: '{daemon.OtlpEndpoint}' is not an absolute URL.");
        }

        Range(errors, "Daemon:MaxConnections", daemon.MaxConnections, 1, 10_000);
        Range(errors, "Daemon:IdleTimeoutSeconds", daemon.IdleTimeoutSeconds, 1, 3600);
        Range(errors, "Daemon:ShutdownGraceSeconds", daemon.ShutdownGraceSeconds, 1, 3600);
        Range(errors, "Daemon:SampleSeconds", daemon.SampleSeconds, 0.1, 3600);
        Range(errors, "Daemon:CompactEveryMinutes", daemon.CompactEveryMinutes, 0.05, 7 * 24 * 60);
        Range(errors, "Daemon:MaxAttempts", daemon.MaxAttempts, 1, 100);
        Range(errors, "Daemon:RetryBaseSeconds", daemon.RetryBaseSeconds, 0.01, 86400);
        Range(errors, "Daemon:FaultRetries", daemon.FaultRetries, 0, 1000);
        Range(errors, "Daemon:FaultRetryBaseSeconds", daemon.FaultRetryBaseSeconds, 0.01, 300);
        Range(errors, "Daemon:HealthSearchFailureMinutes", daemon.HealthSearchFailureMinutes, 0.1, 24 * 60);
        Range(errors, "Daemon:HealthDeadRatio", daemon.HealthDeadRatio, 0.01, 1);
        Range(errors, "Daemon:HealthMinFreeShare", daemon.HealthMinFreeShare, 0, 0.9);
    }

    private static void Range(List<string> errors, string name, double value, double min, double max)
    {
        if (double.IsNaN(value) || value < min || value > max)
        {
            errors.Add($"{name}: {value} is out of range; allowed {min} to {max}.");
        }
    }
}

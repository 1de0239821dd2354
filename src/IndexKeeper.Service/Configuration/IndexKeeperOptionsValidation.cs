using Microsoft.Extensions.Options;

namespace IndexKeeper.Service.Configuration;

/// <summary>
/// <see cref="IndexKeeperOptionsValidator"/> in the .NET options validation pipeline: the options factory runs
/// it when the settings are first asked for, and every failure comes back at once in one
/// <see cref="OptionsValidationException"/>.
/// </summary>
/// <param name="rootsRequired">False for commands that only read the index: they need no root.</param>
internal sealed class IndexKeeperOptionsValidation(bool rootsRequired) : IValidateOptions<IndexKeeperOptions>
{
    public ValidateOptionsResult Validate(string? name, IndexKeeperOptions options) =>
        IndexKeeperOptionsValidator.Validate(options, rootsRequired) is { Count: > 0 } errors
            ? ValidateOptionsResult.Fail(errors)
            : ValidateOptionsResult.Success;
}

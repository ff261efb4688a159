using System.Reflection;
using Microsoft.Extensions.Configuration;

namespace ModelWatch.Store.Configuration;

/// <summary>
/// Finds keys under ModelWatch's own configuration sections that nothing reads (a typo such as
/// <c>Daemon__Concurency</c> would otherwise be ignored in silence), by comparing them with the public settable
/// properties of each section's options class, into nested classes and dictionaries of classes.
/// </summary>
public static class UnknownSettings
{
    /// <summary>The full paths of unknown keys, sorted.</summary>
    /// <param name="configuration">The configuration to audit.</param>
    /// <param name="sections">Each audited section and the options class it binds to.</param>
    public static IReadOnlyList<string> Find(IConfiguration configuration, IReadOnlyDictionary<string, Type> sections)
    {
        ArgumentNullException.ThrowIfNull(configuration);
        ArgumentNullException.ThrowIfNull(sections);
        var unknown = new List<string>();
        foreach ((string name, Type type) in sections)
        {
            if (DictionaryValue(type) is { } value)
            {
                foreach (IConfigurationSection entry in configuration.GetSection(name).GetChildren())
                {
                    Visit(entry, value, unknown);
                }
            }
            else
            {
                Visit(configuration.GetSection(name), type, unknown);
            }
        }

        unknown.Sort(StringComparer.OrdinalIgnoreCase);
        return unknown;
    }

    /// <summary>The settable property names of <paramref name="type"/>, for a message that lists what is known.</summary>
    public static IReadOnlyList<string> KnownKeys(Type type)
    {
        ArgumentNullException.ThrowIfNull(type);
        return [.. Settable(type).Select(p => p.Name)];
    }

    private static void Visit(IConfigurationSection section, Type type, List<string> unknown)
    {
        Dictionary<string, PropertyInfo> properties = Settable(type).ToDictionary(p => p.Name, StringComparer.OrdinalIgnoreCase);
        foreach (IConfigurationSection child in section.GetChildren())
        {
            if (!properties.TryGetValue(child.Key, out PropertyInfo? property))
            {
                unknown.Add(child.Path);
                continue;
            }

            Type target = property.PropertyType;
            if (DictionaryValue(target) is { } value)
            {
                foreach (IConfigurationSection entry in child.GetChildren())
                {
                    Visit(entry, value, unknown);
                }
            }
            else if (IsSection(target))
            {
                Visit(child, target, unknown);
            }
        }
    }

    /// <summary>The value type of a dictionary of sections, or null.</summary>
    private static Type? DictionaryValue(Type type) =>
        type.IsGenericType && type.GetGenericTypeDefinition() == typeof(Dictionary<,>) && IsSection(type.GetGenericArguments()[1]) ? type.GetGenericArguments()[1] : null;

    private static bool IsSection(Type type) =>
        type.IsClass && type != typeof(string) && !type.IsArray && !typeof(System.Collections.IEnumerable).IsAssignableFrom(type);

    private static IEnumerable<PropertyInfo> Settable(Type type) =>
        type.GetProperties(BindingFlags.Public | BindingFlags.Instance).Where(p => p.SetMethod is { IsPublic: true } || IsCollection(p.PropertyType));

    private static bool IsCollection(Type type) => type != typeof(string) && typeof(System.Collections.IEnumerable).IsAssignableFrom(type);
}
